// Worker threads start without the parent's TypeScript loader: register tsx here, then
// load the real worker (train-worker.ts). Plain JavaScript so Node can start it as is.
import { register } from "tsx/esm/api";

register();
await import("./train-worker.ts");
