// The package's ES build has no declarations of its own beside it; it is the same API as the main entry.
declare module "maxrects-packer/dist/maxrects-packer.mjs" {
  export * from "maxrects-packer/dist/index";
}
