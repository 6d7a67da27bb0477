/** Material keys: how a part's free-text material ("PLA", "petg", "TPU 95A", "Nylon PA6") maps to a key the workshop prices and printers take. */
import { isMaterialKey, MATERIALS, MATERIAL_KEYS, type MaterialKey } from "../estimate/materials";

export type { MaterialKey };
export { MATERIAL_KEYS };

/**
 * The key of a material name, or null when the workshop does not print it. Accepted: the key
 * itself ("pla"), the reference name ("Nylon (PA6)"), a name whose first word is a key
 * ("TPU 95A", "Nylon PA6", "PLA Matte"), or the first word of a reference name ("nylon"). Case and
 * surrounding spaces are ignored.
 */
export function materialKeyOf(name: string): MaterialKey | null {
  const n = name.trim().toLowerCase();
  if (!n) return null;
  if (isMaterialKey(n)) return n;
  const byName = MATERIAL_KEYS.find((k) => MATERIALS[k].name.toLowerCase() === n || MATERIALS[k].name.toLowerCase().startsWith(`${n} `));
  if (byName) return byName;
  const first = n.split(/\s+/)[0] ?? "";
  return isMaterialKey(first) ? first : null;
}

/** The reference name shown for a key ("PLA", "Nylon (PA6)"). */
export function materialName(key: MaterialKey): string {
  return MATERIALS[key].name;
}
