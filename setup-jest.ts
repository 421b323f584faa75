// Component tests run zoneless, like the app.
import { setupZonelessTestEnv } from 'jest-preset-angular/setup-env/zoneless';
// The shell's sync indicator opens the user's Dexie database; jsdom has no IndexedDB of its own.
import 'fake-indexeddb/auto';
import * as v8 from 'node:v8';

setupZonelessTestEnv();

// jsdom lacks structuredClone; Dexie on fake-indexeddb needs it.
globalThis.structuredClone ??= <T>(value: T): T => v8.deserialize(v8.serialize(value)) as T;
