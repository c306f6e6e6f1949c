// Typed arrays ↔ SQLite BLOBs. Copies so the stored bytes never alias a live array and so the
// result is aligned for its element size whatever Buffer pooling did.

export function toBlob(array: ArrayBufferView): Buffer {
  return Buffer.from(new Uint8Array(array.buffer, array.byteOffset, array.byteLength));
}

function copyBytes(blob: Uint8Array): ArrayBuffer {
  const out = new ArrayBuffer(blob.byteLength);
  new Uint8Array(out).set(blob);
  return out;
}

export function int32FromBlob(blob: Uint8Array | null | undefined): Int32Array {
  return blob ? new Int32Array(copyBytes(blob)) : new Int32Array(0);
}

export function float64FromBlob(blob: Uint8Array): Float64Array {
  return new Float64Array(copyBytes(blob));
}

export function float32FromBlob(blob: Uint8Array): Float32Array {
  return new Float32Array(copyBytes(blob));
}

export function uint16FromBlob(blob: Uint8Array): Uint16Array {
  return new Uint16Array(copyBytes(blob));
}

export function uint8FromBlob(blob: Uint8Array): Uint8Array {
  return new Uint8Array(copyBytes(blob));
}
