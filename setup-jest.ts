// Component tests run zoneless, like the app.
import { setupZonelessTestEnv } from 'jest-preset-angular/setup-env/zoneless';
// The shell's sync indicator opens the user's Dexie database; jsdom has no IndexedDB of its own.
import 'fake-indexeddb/auto';
import * as v8 from 'node:v8';

setupZonelessTestEnv();

// jsdom lacks structuredClone; Dexie on fake-indexeddb needs it.
globalThis.structuredClone ??= <T>(value: T): T => v8.deserialize(v8.serialize(value)) as T;

// jsdom has no matchMedia; uPlot reads it when its module loads (device pixel ratio changes).
window.matchMedia ??= (query: string) =>
  ({
    matches: false, media: query, onchange: null,
    addListener: () => undefined, removeListener: () => undefined,
    addEventListener: () => undefined, removeEventListener: () => undefined, dispatchEvent: () => false,
  }) as MediaQueryList;

// jsdom's Blob has no text(); the app reads the JSON error body of a file request with it.
Blob.prototype.text ??= function text(this: Blob): Promise<string> {
  return new Promise((resolve, reject) => {
    const reader = new FileReader();
    reader.onload = () => resolve(String(reader.result));
    reader.onerror = () => reject(reader.error);
    reader.readAsText(this);
  });
};

// jsdom has no object URLs; a download made in the page creates and later revokes one.
URL.createObjectURL ??= () => 'blob:jsdom-stand-in';
URL.revokeObjectURL ??= () => undefined;
