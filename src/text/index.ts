// Public surface of src/text (docs/design.md §2, §5): import → language id → tokens → vocabulary.
export * from './types.js';
export * from './import/index.js';
export * from './language/index.js';
export * from './tokens/index.js';
export * from './vocabulary/index.js';
