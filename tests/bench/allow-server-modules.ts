// Imported first by the benchmarks that run server code in a plain Node process: marks the
// 'server-only' package as already loaded with nothing in it (as Next does on the server), without
// the react-server condition, which would also swap React for the build @react-pdf cannot render with.
import Module, { createRequire } from 'node:module';
import path from 'node:path';

const resolved = createRequire(path.join(process.cwd(), 'package.json')).resolve('server-only');
const stub = new Module(resolved);
stub.filename = resolved;
stub.loaded = true;
stub.exports = {};
(Module as unknown as { _cache: Record<string, Module> })._cache[resolved] = stub;
