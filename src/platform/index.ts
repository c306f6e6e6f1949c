// Public surface of the platform adapters: code that talks to the operating system, other
// programs or the runtime — worker threads under tsx, the virus scanner run as a child process,
// the installation's key file — kept apart from the use cases in src/services.
export { packageTsconfigPath, startTypeScriptWorker, tsxApiUrl } from './typescript-runtime.js';
export { parseScanCommand, scannerFromSetting, describeScanning, scanUpload, SCAN_TIMEOUT_MS, SCAN_INCOMPLETE, type UploadScanner } from './scan-upload.js';
export { installationKey, BUNDLE_KEY_FILE } from './bundle-key.js';
export { machineSize } from './machine-size.js';
