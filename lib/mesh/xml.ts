import { MeshReadError } from "./errors";

/**
 * A small, strict, non-validating XML scanner over UTF-8 bytes, enough for 3MF parts. It refuses
 * any DOCTYPE (and so every entity definition: no entity expansion is possible), knows only the
 * five predefined entities and character references, and checks that tags nest.
 */
export interface XmlTag {
  /** Element name as written, including any prefix. */
  name: string;
  /** Number of attributes; their byte ranges are in `ranges` (nameStart, nameEnd, valStart, valEnd). */
  count: number;
  ranges: Int32Array;
  bytes: Uint8Array;
  /** Byte index just past the tag's closing '>'. */
  end: number;
}

export interface XmlHandler {
  /**
   * An element starts. A handler that reads the element's content itself (a fast path) returns the
   * index where scanning resumes; the scanner still checks the closing tag that follows.
   */
  open(tag: XmlTag, selfClosing: boolean): number | void;
  close(name: string): void;
}

const MAX_DEPTH = 256;
const MAX_ATTRS = 64;
const utf8 = new TextDecoder("utf-8");

const isWs = (c: number) => c === 32 || c === 9 || c === 10 || c === 13;
const isNameEnd = (c: number) => isWs(c) || c === 62 || c === 47 || c === 61;

function bad(msg: string): never {
  throw new MeshReadError("BAD_XML", msg);
}

function indexOfSeq(b: Uint8Array, seq: number[], from: number): number {
  const first = seq[0]!;
  for (let i = b.indexOf(first, from); i >= 0; i = b.indexOf(first, i + 1)) {
    let ok = true;
    for (let j = 1; j < seq.length; j++) if (b[i + j] !== seq[j]) { ok = false; break; }
    if (ok) return i;
  }
  return -1;
}

const ascii = (s: string) => [...s].map((c) => c.charCodeAt(0));
const END_COMMENT = ascii("-->");
const END_CDATA = ascii("]]>");
const END_PI = ascii("?>");

function decodeName(b: Uint8Array, s: number, e: number): string {
  let out = "";
  for (let i = s; i < e; i++) {
    const c = b[i]!;
    if (c > 127) return utf8.decode(b.subarray(s, e));
    out += String.fromCharCode(c);
  }
  return out;
}

/**
 * Element names repeat (a mesh is a million `vertex` and `triangle` tags), so names are looked up
 * by their bytes in a small cache of recent names before a string is made: no garbage per element.
 */
class NameCache {
  private readonly names: string[] = [];
  name(b: Uint8Array, s: number, e: number): string {
    const len = e - s;
    outer: for (let k = 0; k < this.names.length; k++) {
      const n = this.names[k]!;
      if (n.length !== len) continue;
      for (let j = 0; j < len; j++) if (n.charCodeAt(j) !== b[s + j]) continue outer;
      if (k > 0) { this.names[k] = this.names[k - 1]!; this.names[k - 1] = n; } // move towards the front
      return n;
    }
    const n = decodeName(b, s, e);
    // Only pure ASCII names are cached (their bytes are their char codes).
    if (n.length === len) { if (this.names.length >= 8) this.names.pop(); this.names.unshift(n); }
    return n;
  }
}

export function scanXml(b: Uint8Array, h: XmlHandler): void {
  const names = new NameCache();
  const stack: string[] = [];
  const tag: XmlTag = { name: "", count: 0, ranges: new Int32Array(MAX_ATTRS * 4), bytes: b, end: 0 };
  const n = b.length;
  let i = 0;
  let sawRoot = false;
  while (i < n) {
    const lt = b.indexOf(60, i); // '<'
    if (lt < 0) break;
    i = lt + 1;
    const c = b[i];
    if (c === 33) { // '<!'
      if (b[i + 1] === 45 && b[i + 2] === 45) {
        const e = indexOfSeq(b, END_COMMENT, i + 3);
        if (e < 0) bad("unterminated XML comment");
        i = e + 3;
      } else if (b[i + 1] === 91 && decodeName(b, i + 2, i + 8) === "CDATA[") {
        const e = indexOfSeq(b, END_CDATA, i + 8);
        if (e < 0) bad("unterminated CDATA section");
        i = e + 3;
      } else {
        throw new MeshReadError("DOCTYPE", "XML declarations such as <!DOCTYPE> or <!ENTITY> are refused (3MF parts need none, and they allow entity expansion attacks)");
      }
      continue;
    }
    if (c === 63) { // '<?'
      const e = indexOfSeq(b, END_PI, i + 1);
      if (e < 0) bad("unterminated processing instruction");
      i = e + 2;
      continue;
    }
    if (c === 47) { // '</'
      let e = i + 1;
      while (e < n && !isNameEnd(b[e]!)) e++;
      const name = names.name(b, i + 1, e);
      while (e < n && isWs(b[e]!)) e++;
      if (b[e] !== 62) bad(`malformed closing tag </${name}`);
      const open = stack.pop();
      if (open !== name) bad(open === undefined ? `closing tag </${name}> without an opening tag` : `closing tag </${name}> does not match <${open}>`);
      h.close(name);
      i = e + 1;
      continue;
    }
    let e = i;
    while (e < n && !isNameEnd(b[e]!)) e++;
    if (e === i) bad("malformed tag: '<' not followed by a name");
    if (stack.length === 0 && sawRoot) bad("more than one root element");
    tag.name = names.name(b, i, e);
    tag.count = 0;
    let selfClosing = false;
    for (;;) {
      while (e < n && isWs(b[e]!)) e++;
      if (e >= n) bad(`unterminated tag <${tag.name}`);
      const ch = b[e]!;
      if (ch === 62) { e++; break; }
      if (ch === 47) {
        if (b[e + 1] !== 62) bad(`malformed tag <${tag.name}`);
        selfClosing = true;
        e += 2;
        break;
      }
      const ns = e;
      while (e < n && !isNameEnd(b[e]!)) e++;
      const ne = e;
      if (ne === ns) bad(`malformed attribute in <${tag.name}>`);
      while (e < n && isWs(b[e]!)) e++;
      if (b[e] !== 61) bad(`attribute without a value in <${tag.name}>`);
      e++;
      while (e < n && isWs(b[e]!)) e++;
      const q = b[e];
      if (q !== 34 && q !== 39) bad(`attribute value not quoted in <${tag.name}>`);
      const vs = e + 1;
      const ve = b.indexOf(q, vs);
      if (ve < 0) bad(`unterminated attribute value in <${tag.name}>`);
      if (tag.count >= MAX_ATTRS) bad(`too many attributes in <${tag.name}>`);
      const r = tag.count++ * 4;
      tag.ranges[r] = ns; tag.ranges[r + 1] = ne; tag.ranges[r + 2] = vs; tag.ranges[r + 3] = ve;
      e = ve + 1;
    }
    sawRoot = true;
    if (!selfClosing) {
      if (stack.length >= MAX_DEPTH) bad(`elements nested deeper than ${MAX_DEPTH}`);
      stack.push(tag.name);
    }
    tag.end = e;
    const resume = h.open(tag, selfClosing);
    if (selfClosing) h.close(tag.name);
    i = typeof resume === "number" && resume > e ? resume : e;
  }
  if (stack.length > 0) bad(`unexpected end of XML inside <${stack[stack.length - 1]}>`);
  if (!sawRoot) bad("no XML element found");
}

/** Index of the attribute named `name` (compared as bytes), or -1. */
export function attrIndex(t: XmlTag, name: string): number {
  const b = t.bytes;
  outer: for (let k = 0; k < t.count; k++) {
    const s = t.ranges[k * 4]!, e = t.ranges[k * 4 + 1]!;
    if (e - s !== name.length) continue;
    for (let j = 0; j < name.length; j++) if (b[s + j] !== name.charCodeAt(j)) continue outer;
    return k;
  }
  return -1;
}

export function attrName(t: XmlTag, k: number): string {
  return decodeName(t.bytes, t.ranges[k * 4]!, t.ranges[k * 4 + 1]!);
}

const ENTITIES: Record<string, string> = { lt: "<", gt: ">", amp: "&", quot: '"', apos: "'" };

/** Attribute value with entity and character references resolved. */
export function attrValue(t: XmlTag, k: number): string {
  const raw = utf8.decode(t.bytes.subarray(t.ranges[k * 4 + 2]!, t.ranges[k * 4 + 3]!));
  if (!raw.includes("&")) return raw;
  return raw.replace(/&([^;&]*);?/g, (m, ent: string) => {
    if (!m.endsWith(";")) bad(`unterminated entity reference '${m.slice(0, 20)}'`);
    if (ent in ENTITIES) return ENTITIES[ent]!;
    const num = /^#(\d+)$/.exec(ent) ?? /^#x([0-9a-fA-F]+)$/.exec(ent);
    if (num) {
      const cp = parseInt(num[1]!, ent[1] === "x" ? 16 : 10);
      if (cp > 0 && cp <= 0x10ffff) return String.fromCodePoint(cp);
    }
    return bad(`undefined entity '&${ent.slice(0, 20)};' (no DTD is allowed, so only the predefined ones exist)`);
  });
}

export function attr(t: XmlTag, name: string): string | undefined {
  const k = attrIndex(t, name);
  return k < 0 ? undefined : attrValue(t, k);
}

export const POW10 = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

/**
 * Parse a decimal number from bytes [s, e). Fast path: at most 15 significant digits and a power
 * of ten up to 22, where m·10^e (or m/10^e) is exactly rounded (Clinger 1990); anything else goes
 * through Number(). Returns NaN for a malformed value.
 */
export function numberAt(b: Uint8Array, s: number, e: number): number {
  let i = s;
  while (i < e && isWs(b[i]!)) i++;
  while (e > i && isWs(b[e - 1]!)) e--;
  const start = i;
  let neg = false;
  if (b[i] === 45) { neg = true; i++; } else if (b[i] === 43) i++;
  let m = 0, digits = 0, scale = 0, any = false;
  while (i < e && b[i]! >= 48 && b[i]! <= 57) { m = m * 10 + (b[i]! - 48); digits++; i++; any = true; }
  if (b[i] === 46) {
    i++;
    while (i < e && b[i]! >= 48 && b[i]! <= 57) { m = m * 10 + (b[i]! - 48); digits++; scale++; i++; any = true; }
  }
  if (!any) return NaN;
  if (i === e && digits <= 15 && scale <= 22) return (neg ? -m : m) / POW10[scale]!;
  const str = decodeName(b, start, e);
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(str)) return NaN;
  return Number(str);
}

/** The attribute's value as a number (see numberAt). */
export function attrNumber(t: XmlTag, k: number): number {
  return numberAt(t.bytes, t.ranges[k * 4 + 2]!, t.ranges[k * 4 + 3]!);
}
