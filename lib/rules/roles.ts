// Who may do what: one table, read by the server's checks and by the navigation.
// Framework-free so the client can use it to hide what the server would refuse anyway.
/** One role per account (see DEVELOPERS.md, Decisions). The users table takes its enum from here. */
export const roles = ["member", "operator", "admin"] as const;
export type Role = (typeof roles)[number];

export const permissions = {
  "bench:use": ["member"],
  "floor:view": ["operator", "admin"],
  "printers:set-state": ["operator", "admin"],
  "printers:view": ["member", "operator", "admin"],
  "printers:manage": ["admin"],
  "materials:view": ["operator", "admin"],
  "materials:manage": ["admin"],
  "spools:manage": ["operator", "admin"],
  "hours:edit": ["admin"],
  "quotes:request": ["member", "operator", "admin"],
  "workshop:view": ["operator", "admin"],
  "workshop:edit": ["admin"],
  "people:manage": ["admin"],
  "mail:admin": ["admin"],
  "account:messages": ["member", "operator", "admin"],
  "ledger:own": ["member"],
  "ledger:admin": ["admin"],
  "queue:send": ["member"],
  "queue:manage": ["operator", "admin"],
  "parts:accept-mesh": ["operator", "admin"],
  "plates:view": ["member", "operator", "admin"],
  "plates:act": ["operator", "admin"],
  "insights:view": ["operator", "admin"],
  "insights:money": ["admin"],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof permissions;

export function can(role: Role, action: Action): boolean {
  return (permissions[action] as readonly Role[]).includes(role);
}

export const roleHome: Record<Role, string> = {
  member: "/bench",
  operator: "/floor",
  admin: "/workshop",
};

export interface NavItem {
  href: string;
  label: string;
}

/** The navigation each role sees. Later pages add themselves here. */
export const navByRole: Record<Role, NavItem[]> = {
  member: [
    { href: "/bench", label: "Bench" },
    { href: "/bench/parts", label: "My parts" },
    { href: "/ledger", label: "Ledger" },
    { href: "/account", label: "Account" },
  ],
  operator: [
    { href: "/floor", label: "Floor" },
    { href: "/printers", label: "Printers" },
    { href: "/materials", label: "Materials" },
    { href: "/insights", label: "Insights" },
    { href: "/account", label: "Account" },
  ],
  admin: [
    { href: "/workshop", label: "Workshop settings" },
    { href: "/floor", label: "Floor" },
    { href: "/printers", label: "Printers" },
    { href: "/materials", label: "Materials" },
    { href: "/workshop/hours", label: "Opening hours" },
    { href: "/workshop/people", label: "People" },
    { href: "/workshop/billing", label: "Billing" },
    { href: "/insights", label: "Insights" },
  ],
};

export const roleLabel: Record<Role, string> = { member: "Member", operator: "Operator", admin: "Admin" };
