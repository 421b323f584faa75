// Component tests run zoneless, like the app.
import { setupZonelessTestEnv } from 'jest-preset-angular/setup-env/zoneless';
import * as v8 from 'node:v8';

setupZonelessTestEnv();

// jsdom lacks structuredClone; Dexie on fake-indexeddb needs it.
globalThis.structuredClone ??= <T>(value: T): T => v8.deserialize(v8.serialize(value)) as T;
