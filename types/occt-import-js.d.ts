declare module "occt-import-js" {
  import type { OcctModule } from "@/lib/mesh/step-read";
  /** Emscripten factory: resolves once the WebAssembly module is compiled and instantiated. */
  const factory: (opts?: {
    locateFile?: (path: string, prefix: string) => string;
    wasmBinary?: ArrayBuffer | Uint8Array;
    print?: (text: string) => void;
    printErr?: (text: string) => void;
  }) => Promise<OcctModule>;
  export default factory;
}
