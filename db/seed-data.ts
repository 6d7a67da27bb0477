// The invented demo scenario: one workshop and its people. Later issues add printers,
// materials, assemblies and history. Demo passwords are printed by `npm start`.
import type { Role } from "./schema/users";

export const demoWorkshop = {
  id: 1,
  name: "Kettle Lane Workshop",
  timezone: "Europe/Berlin",
  currency: "EUR",
  contactEmail: "desk@kettlelane.example",
  defaultLayerHeightMm: 0.2,
  defaultWalls: 3,
  defaultInfillPercent: 15,
  plateFeeCents: 150,
  safetyNote:
    "Printers have a hot nozzle and bed and moving parts. Follow the workshop's house rules and local codes; plates that run past closing are unattended.",
};

export interface DemoUser {
  email: string;
  name: string;
  role: Role;
  password: string;
}

export const demoUsers: DemoUser[] = [
  { email: "mira@kettlelane.example", name: "Mira Holt", role: "admin", password: "admin-demo-2026" },
  { email: "tomas@kettlelane.example", name: "Tomas Reyes", role: "operator", password: "operator-demo-2026" },
  { email: "jun@kettlelane.example", name: "Jun Ishikawa", role: "member", password: "member-demo-2026" },
  { email: "priya@kettlelane.example", name: "Priya Ndlovu", role: "member", password: "member-demo-2026" },
];
