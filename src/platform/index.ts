// Public surface of the platform adapters: code that talks to the process, the operating system
// or the runtime (worker threads under tsx), kept apart from the use cases in src/services.
export { packageTsconfigPath, startTypeScriptWorker, tsxApiUrl } from './typescript-runtime.js';
