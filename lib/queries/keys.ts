// Query keys in one place: mutations invalidate by prefix.
export const queryKeys = {
  workshop: { all: ["workshop"] as const, settings: () => ["workshop", "settings"] as const },
  printers: { all: ["printers"] as const, list: () => ["printers", "list"] as const },
  materials: { all: ["materials"] as const, list: () => ["materials", "list"] as const },
  hours: { all: ["hours"] as const },
  quotes: { all: ["quotes"] as const, part: (input: unknown) => ["quotes", "part", input] as const },
  assemblies: { all: ["assemblies"] as const, list: () => ["assemblies", "list"] as const, detail: (id: number) => ["assemblies", "detail", id] as const },
  parts: { all: ["parts"] as const, mine: () => ["parts", "mine"] as const, detail: (id: number) => ["parts", "detail", id] as const },
  people: { all: ["people"] as const, list: () => ["people", "list"] as const, invitations: () => ["people", "invitations"] as const },
  mail: { all: ["mail"] as const, mailbox: () => ["mail", "mailbox"] as const, outbox: () => ["mail", "outbox"] as const, preferences: () => ["mail", "preferences"] as const },
  queue: { all: ["queue"] as const, board: () => ["queue", "board"] as const, part: (id: number) => ["queue", "part", id] as const },
  plates: { all: ["plates"] as const, detail: (id: number) => ["plates", "detail", id] as const },
  ledger: { all: ["ledger"] as const, mine: () => ["ledger", "mine"] as const, balances: () => ["ledger", "balances"] as const },
  insights: { all: ["insights"] as const, period: (search: string) => ["insights", search] as const },
  orientation: { all: ["orientation"] as const, part: (id: number) => ["orientation", "part", id] as const, split: (id: number) => ["orientation", "split", id] as const },
};
