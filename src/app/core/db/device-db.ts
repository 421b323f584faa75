import { Injectable, effect, inject, signal, untracked } from '@angular/core';
import Dexie from 'dexie';
import { v4 as uuidv4 } from 'uuid';
import { AuthStore } from '../auth/auth-store';
import { FluxDb, META, SCHEMA_VERSION, dbNameFor } from './db-schema';

/** Errors after which reopening the database and running the work again is safe and useful. */
function connectionLost(err: unknown): boolean {
  const e = err as { name?: string; message?: string; inner?: { name?: string } } | null;
  const name = e?.name ?? '';
  return (
    name === Dexie.errnames.DatabaseClosed ||
    name === 'InvalidStateError' ||
    e?.inner?.name === 'InvalidStateError' ||
    /connection to indexed ?db server lost/i.test(e?.message ?? '')
  );
}

/**
 * The signed-in user's database on this device. It follows the session: another user gets
 * another database. A schema upgrade from another tab closes this one and asks for a reload; a
 * lost connection is reopened and the write is run again (a Dexie transaction either commits
 * whole or not at all, so a retry never doubles it and never drops it).
 */
@Injectable({ providedIn: 'root' })
export class DeviceDb {
  private readonly auth = inject(AuthStore);
  private readonly current = signal<FluxDb | null>(null);
  readonly db = this.current.asReadonly();
  private readonly blocked = signal(false);
  /** Another tab opened a newer version of the app: this tab must reload. */
  readonly needsReload = this.blocked.asReadonly();
  private readonly device = signal<string | null>(null);
  readonly deviceId = this.device.asReadonly();

  constructor() {
    // Opens and closes the user's IndexedDB connection as the session changes (a connection's
    // lifetime, not a data load: screens read through live queries on it).
    effect(() => {
      const id = this.auth.user()?.id ?? null;
      untracked(() => this.switchTo(id));
    });
  }

  private switchTo(userId: string | null): void {
    const old = this.current();
    if (old && userId && old.name === dbNameFor(userId)) return;
    old?.close();
    this.device.set(null);
    if (!userId) {
      this.current.set(null);
      return;
    }
    const db = new FluxDb(dbNameFor(userId));
    db.on('versionchange', () => {
      // A newer app in another tab needs this connection gone to upgrade the schema.
      db.close();
      this.blocked.set(true);
      return false;
    });
    this.current.set(db);
    void this.ensureMeta(db);
  }

  private async ensureMeta(db: FluxDb): Promise<void> {
    try {
      const id = await db.transaction('rw', db.meta, async () => {
        const row = await db.meta.get(META.deviceId);
        if (typeof row?.value === 'string') return row.value;
        const fresh = uuidv4();
        await db.meta.bulkPut([
          { key: META.deviceId, value: fresh },
          { key: META.schemaVersion, value: SCHEMA_VERSION },
        ]);
        return fresh;
      });
      if (this.current() === db) this.device.set(id);
    } catch (err) {
      // A database closed meanwhile (sign-out, removal) needs no device id any more.
      if (!this.blocked() && this.current() === db) console.error('[device-db] could not read the device id', err);
    }
  }

  /** Deletes a user's database from this device (closed first if it is the open one). */
  async remove(userId: string): Promise<void> {
    const name = dbNameFor(userId);
    const open = this.current();
    if (open?.name === name) {
      open.close();
      this.current.set(null);
      this.device.set(null);
    }
    await Dexie.delete(name);
  }

  /** The device id, read from the database if it is not known yet. */
  async deviceIdNow(): Promise<string> {
    const known = this.device();
    if (known) return known;
    const db = this.require();
    await this.ensureMeta(db);
    return this.device() ?? (await this.run(async (d) => String((await d.meta.get(META.deviceId))?.value)));
  }

  require(): FluxDb {
    const db = this.current();
    if (!db) throw new Error('Nobody is signed in on this device');
    if (this.blocked()) throw new Error('Fluxwalk was updated in another tab: reload this page to continue');
    return db;
  }

  /** Runs database work; after a lost connection the database is reopened and the work runs once more. */
  async run<T>(work: (db: FluxDb) => Promise<T>): Promise<T> {
    const db = this.require();
    try {
      return await work(db);
    } catch (err) {
      if (!connectionLost(err) || this.blocked()) throw err;
      console.warn('[device-db] connection lost; reopening', err);
      if (db.isOpen()) db.close();
      await db.open();
      return work(db);
    }
  }
}
