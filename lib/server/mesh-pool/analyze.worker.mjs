// Worker-thread entry of the upload analysis pool (./pool.ts). Node runs plain JavaScript here, so it
// registers tsx (the same loader the project's scripts use) and loads the TypeScript task through it.
import { register } from "tsx/esm/api";

register();
const task = await import("./analyze-task.ts");

export default task.default;
