import { MeshReadError } from "./errors";
import { stlPositions } from "./stl-views";

/**
 * STL reading. Layout per the STL format description (3D Systems 1989; Burns, Automated
 * Fabrication §6.5; Bourke 1999): binary = 80-byte header, uint32 LE count N, N × 50-byte records;
 * ASCII = solid/facet normal/outer loop/vertex×3/endloop/endfacet/endsolid.
 */
export type StlKind = { kind: "binary"; count: number; trailingBytes: number } | { kind: "ascii" };

const WS = (c: number) => c === 32 || c === 9 || c === 10 || c === 13 || c === 12 || c === 11;

function lower(c: number): number {
  return c >= 65 && c <= 90 ? c + 32 : c;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Bytes allowed in a solid's name line: printable ASCII, tab and UTF-8 sequences (no NUL, no controls). */
const isTextByte = (c: number) => c === 9 || (c >= 32 && c !== 127);

/**
 * The ASCII grammar, checked on the opening of the file before `solid` is trusted: `solid`, a name
 * line of text that ends with a line break, then `endsolid` or one whole first facet
 * (`facet normal n n n outer loop vertex x y z ×3 endloop endfacet`, numbers as decimals).
 * A binary header may begin with `solid`; its records do not spell out a facet.
 */
function looksAscii(b: Uint8Array): boolean {
  let i = 0;
  while (i < b.length && WS(b[i]!)) i++;
  for (let j = 0; j < 5; j++) if (lower(b[i + j] ?? 0) !== "solid".charCodeAt(j)) return false;
  i += 5;
  while (i < b.length && b[i] !== 10 && b[i] !== 13) {
    if (!isTextByte(b[i]!)) return false;
    i++;
  }
  if (i >= b.length) return true; // just "solid name": text, the reader reports it has no facets
  const token = (): string => {
    while (i < b.length && WS(b[i]!)) i++;
    let t = "";
    while (i < b.length && !WS(b[i]!) && t.length < 40) t += String.fromCharCode(lower(b[i++]!));
    return t;
  };
  const first = token();
  if (first === "endsolid") return true;
  const words = ["facet", "normal", "#", "#", "#", "outer", "loop"];
  for (let v = 0; v < 3; v++) words.push("vertex", "#", "#", "#");
  words.push("endloop", "endfacet");
  let k = 0;
  for (let t = first; k < words.length; t = token(), k++) {
    const w = words[k]!;
    if (w === "#" ? !NUMBER.test(t) && !/^[+-]?(nan|inf|infinity)$/.test(t) : t !== w) return false;
  }
  return true;
}

function startsWithSolid(b: Uint8Array): boolean {
  let i = 0;
  while (i < b.length && WS(b[i]!)) i++;
  return [..."solid"].every((ch, j) => lower(b[i + j] ?? 0) === ch.charCodeAt(0));
}

function looksBinary(b: Uint8Array): boolean {
  const n = Math.min(b.length, 84 + 50 * 20);
  for (let i = 0; i < n; i++) if (b[i]! > 127 || b[i] === 0) return true;
  return false;
}

/** Trailing bytes after 84 + 50·N that are still read as binary (some writers pad a little). */
const MAX_TRAILING = 1024;

/**
 * Decide binary or ASCII: the exact binary size 84 + 50·N first; then the ASCII grammar of the
 * opening (above); then the binary size with up to MAX_TRAILING bytes after the last record; then
 * errors that say which rule failed (see REFERENCES: robust detection).
 */
export function sniffStl(b: Uint8Array): StlKind {
  if (b.length === 0) throw new MeshReadError("EMPTY", "the file is empty (0 bytes)");
  if (b.length < 84) {
    if (startsWithSolid(b)) return { kind: "ascii" };
    throw new MeshReadError("TOO_SMALL", `the file is ${b.length} bytes; a binary STL needs at least 84 (80-byte header and a 4-byte triangle count)`);
  }
  const count = new DataView(b.buffer, b.byteOffset, b.byteLength).getUint32(80, true);
  const expected = 84 + 50 * count;
  if (b.length === expected) return { kind: "binary", count, trailingBytes: 0 };
  if (looksAscii(b)) return { kind: "ascii" };
  if (b.length > expected && b.length - expected <= MAX_TRAILING) return { kind: "binary", count, trailingBytes: b.length - expected };
  if (looksBinary(b) || !startsWithSolid(b)) {
    if (!looksBinary(b)) throw new MeshReadError("UNKNOWN_FORMAT", "not an STL file: plain text that does not start with 'solid', and its size does not match a binary STL");
    const fits = Math.floor((b.length - 84) / 50);
    if (b.length < expected) {
      throw new MeshReadError("TRUNCATED", `binary STL declares ${count} triangles (${expected} bytes) but the file has only ${b.length} bytes: truncated, or a wrong count (room for ${fits})`);
    }
    throw new MeshReadError("COUNT_MISMATCH", `binary STL declares ${count} triangles (${expected} bytes) but the file has ${b.length} bytes (room for ${fits} triangles)`);
  }
  return { kind: "ascii" };
}

export function readStlBinary(b: Uint8Array, count: number): Float32Array {
  if (count === 0) throw new MeshReadError("NO_TRIANGLES", "the binary STL declares 0 triangles");
  return stlPositions(b, count);
}

function lineOf(text: string, pos: number): number {
  let n = 1;
  for (let i = 0; i < pos && i < text.length; i++) if (text.charCodeAt(i) === 10) n++;
  return n;
}

/** Parse ASCII STL: any whitespace, any letter case, several solid blocks. */
export function readStlAscii(b: Uint8Array): Float32Array {
  const text = new TextDecoder("latin1").decode(b);
  const len = text.length;
  let pos = 0;
  let out = new Float32Array(9 * 1024);
  let nf = 0; // floats written
  let tokStart = 0;

  const fail = (msg: string): never => {
    throw new MeshReadError("BAD_ASCII", `ASCII STL, line ${lineOf(text, tokStart)}: ${msg}`);
  };
  const token = (): string => {
    while (pos < len && WS(text.charCodeAt(pos))) pos++;
    tokStart = pos;
    while (pos < len && !WS(text.charCodeAt(pos))) pos++;
    return text.slice(tokStart, pos);
  };
  const keyword = (want: string) => {
    const t = token();
    if (t.toLowerCase() !== want) fail(t ? `expected '${want}', found '${t.slice(0, 40)}'` : `expected '${want}', found end of file`);
  };
  const skipLine = () => {
    while (pos < len && text.charCodeAt(pos) !== 10 && text.charCodeAt(pos) !== 13) pos++;
  };
  const number = (): number => {
    const t = token();
    if (!t) fail("expected a number, found end of file");
    const low = t.toLowerCase();
    if (low.includes("nan") || low.includes("inf")) {
      throw new MeshReadError("NON_FINITE", `ASCII STL, line ${lineOf(text, tokStart)}: coordinate '${t.slice(0, 40)}' is not a finite number`);
    }
    if (!NUMBER.test(t)) fail(`expected a number, found '${t.slice(0, 40)}'`);
    const v = Number(t);
    if (!Number.isFinite(v) || !Number.isFinite(Math.fround(v))) {
      throw new MeshReadError("NON_FINITE", `ASCII STL, line ${lineOf(text, tokStart)}: coordinate '${t.slice(0, 40)}' overflows a 32-bit float`);
    }
    return v;
  };

  let solids = 0;
  for (;;) {
    const t = token().toLowerCase();
    if (t === "") break;
    if (t !== "solid") fail(`expected 'solid', found '${t.slice(0, 40)}'`);
    solids++;
    skipLine();
    for (;;) {
      const k = token().toLowerCase();
      if (k === "endsolid") { skipLine(); break; }
      if (k === "") break; // tolerate a missing endsolid at the end of the file
      if (k !== "facet") fail(`expected 'facet' or 'endsolid', found '${k.slice(0, 40)}'`);
      keyword("normal");
      number(); number(); number(); // stored normals are ignored: the vertex order decides
      keyword("outer");
      keyword("loop");
      if (nf + 9 > out.length) {
        const next = new Float32Array(out.length * 2);
        next.set(out);
        out = next;
      }
      for (let v = 0; v < 3; v++) {
        keyword("vertex");
        out[nf++] = number(); out[nf++] = number(); out[nf++] = number();
      }
      keyword("endloop");
      keyword("endfacet");
    }
  }
  if (solids === 0) throw new MeshReadError("BAD_ASCII", "ASCII STL has no 'solid' block");
  if (nf === 0) throw new MeshReadError("NO_TRIANGLES", "the ASCII STL contains no facets");
  return out.slice(0, nf);
}
