// Component tests run zoneless, like the app.
import { setupZonelessTestEnv } from 'jest-preset-angular/setup-env/zoneless';
// The shell's sync indicator opens the user's Dexie database; jsdom has no IndexedDB of its own.
import 'fake-indexeddb/auto';
import { webcrypto } from 'node:crypto';
import * as v8 from 'node:v8';

setupZonelessTestEnv();

// jsdom lacks structuredClone; Dexie on fake-indexeddb needs it.
globalThis.structuredClone ??= <T>(value: T): T => v8.deserialize(v8.serialize(value)) as T;

// jsdom has no matchMedia; uPlot reads it when its module loads (device pixel ratio changes).
window.matchMedia ??= (query: string) =>
  ({
    matches: false,
    media: query,
    onchange: null,
    addListener: () => undefined,
    removeListener: () => undefined,
    addEventListener: () => undefined,
    removeEventListener: () => undefined,
    dispatchEvent: () => false,
  }) as MediaQueryList;

// jsdom's Blob has no text() or arrayBuffer(): the app reads error bodies and hashes files with them.
function readBlob<T>(blob: Blob, how: 'readAsText' | 'readAsArrayBuffer'): Promise<T> {
  return new Promise((resolve, reject) => {
    const reader = new FileReader();
    reader.onload = () => resolve(reader.result as T);
    reader.onerror = () => reject(reader.error);
    reader[how](blob);
  });
}
Blob.prototype.text ??= function text(this: Blob) {
  return readBlob<string>(this, 'readAsText');
};
Blob.prototype.arrayBuffer ??= function arrayBuffer(this: Blob) {
  return readBlob<ArrayBuffer>(this, 'readAsArrayBuffer');
};

// jsdom's crypto has no subtle: digest with Node's Web Crypto (the same standard), the bytes first
// copied into a Node Buffer because jsdom's ArrayBuffer comes from another realm.
if (!globalThis.crypto?.subtle) {
  const nodeBytes = (d: ArrayBuffer | ArrayBufferView) =>
    ArrayBuffer.isView(d) ? Buffer.from(d.buffer, d.byteOffset, d.byteLength) : Buffer.from(d);
  Object.defineProperty(globalThis.crypto, 'subtle', {
    value: { digest: (algorithm: string, data: ArrayBuffer | ArrayBufferView) => webcrypto.subtle.digest(algorithm, nodeBytes(data)) },
  });
}

// jsdom has no object URLs; a download made in the page creates and later revokes one.
URL.createObjectURL ??= () => 'blob:jsdom-stand-in';
URL.revokeObjectURL ??= () => undefined;

// jsdom lays nothing out, so it has no scrollIntoView(); screens call it when a field takes focus.
Element.prototype.scrollIntoView ??= () => undefined;
