import { HttpTestingController } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { Router, provideRouter } from '@angular/router';
import Dexie from 'dexie';
import { dbNameFor, type FluxDb } from '../../core/db/db-schema';
import { signedInDevice } from '../../core/db/testing/signed-in-device';
import { until } from '../../core/db/testing/until';
import { BackupDownload } from '../../core/sync/backup-download';
import { SyncEngine } from '../../core/sync/sync-engine';
import { UserMenu } from './user-menu';

const OP = {
  opId: 'op-1',
  entity: 'collar',
  id: 'c-1',
  baseRev: null,
  op: 'upsert',
  fields: { code: 'A1' },
  base: {},
  sentAt: null,
  createdAt: 'now',
  updatedAt: 'now',
} as const;
const REMOVE = /Sign out and remove this device's data/;

async function menuOnDevice(queued: number) {
  // The fake engine empties the outbox of the device it is given to, which exists only after sign-in.
  const signedIn: { db?: FluxDb } = {};
  const engine = {
    syncNow: jest.fn(async () => {
      await signedIn.db!.outbox.clear();
    }),
    pending: () => 0,
    rejected: () => 0,
    conflicts: () => 0,
  };
  const backup = { save: jest.fn(async () => 'fluxwalk-backup-crew.json') };
  const device = await signedInDevice([
    provideRouter([]),
    { provide: SyncEngine, useValue: engine },
    { provide: BackupDownload, useValue: backup },
  ]);
  const db = (signedIn.db = device.db);
  for (let i = 0; i < queued; i++) await db.outbox.add({ ...OP, opId: `op-${i}`, id: `c-${i}` });
  localStorage.setItem(`fw.board.${device.userId}.progress.c1.all`, '{}');
  const navigate = jest.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
  const fixture = TestBed.createComponent(UserMenu);
  const loader = TestbedHarnessEnvironment.documentRootLoader(fixture);
  const menu = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatMenuHarness);
  await menu.open();
  const answerLogout = () =>
    until(() => {
      const backend = TestBed.inject(HttpTestingController);
      backend.match('/api/auth/csrf').forEach((r) => r.flush({ token: 't' }));
      return backend.match('/api/auth/logout').map((r) => r.flush(null, { status: 204, statusText: 'No Content' })).length;
    }, 'the logout');
  const dbExists = () => Dexie.exists(dbNameFor(device.userId));
  return { ...device, engine, backup, navigate, loader, menu, answerLogout, dbExists };
}

const dialogButton = (loader: ReturnType<typeof TestbedHarnessEnvironment.documentRootLoader>, text: RegExp) =>
  loader.getHarness(MatButtonHarness.with({ ancestor: 'mat-dialog-container', text }));

describe("Sign out and remove this device's data", () => {
  beforeEach(() => localStorage.clear());

  it('when nothing waits to be synced, then the user is signed out and their database and Board copies are removed', async () => {
    const { menu, loader, answerLogout, dbExists, navigate, userId } = await menuOnDevice(0);
    await menu.clickItem({ text: REMOVE });
    expect(await loader.getAllHarnesses(MatDialogHarness)).toHaveLength(0);
    await answerLogout();
    await until(async () => !(await dbExists()), 'the database to go');
    await until(() => navigate.mock.calls.length > 0, 'sign-in to open');
    expect(navigate).toHaveBeenCalledWith('/sign-in');
    expect(Object.keys(localStorage).filter((k) => k.includes(userId))).toEqual([]);
    expect(localStorage.getItem('fw.session')).toBeNull();
  });

  it('when 3 changes are not yet synced, then a dialog warns they will be lost, and Cancel keeps everything', async () => {
    const { menu, loader, dbExists, db, userId } = await menuOnDevice(3);
    await menu.clickItem({ text: REMOVE });
    const dialog = await until(async () => (await loader.getAllHarnesses(MatDialogHarness))[0], 'the warning');
    expect(await dialog.getContentText()).toContain('3 not yet synced will be lost');
    await (await dialogButton(loader, /^Cancel$/)).click();
    await until(async () => (await loader.getAllHarnesses(MatDialogHarness)).length === 0, 'the dialog to close');
    TestBed.inject(HttpTestingController).expectNone('/api/auth/logout');
    expect(await dbExists()).toBe(true);
    expect(await db.outbox.count()).toBe(3);
    expect(localStorage.getItem('fw.session')).not.toBeNull();
    expect(localStorage.getItem(`fw.board.${userId}.progress.c1.all`)).toBe('{}');
  });

  it('when the user saves a backup file first, then the file is saved and the dialog stays open to decide', async () => {
    const { menu, loader, backup } = await menuOnDevice(2);
    await menu.clickItem({ text: REMOVE });
    const dialog = await until(async () => (await loader.getAllHarnesses(MatDialogHarness))[0], 'the warning');
    await (await dialogButton(loader, /Save a backup file/)).click();
    expect(backup.save).toHaveBeenCalledTimes(1);
    await until(async () => (await dialog.getContentText()).includes('Saved fluxwalk-backup-crew.json'), 'the saved note');
  });

  it('when the user syncs first and everything reaches the server, then the warning clears and removing signs out', async () => {
    const { menu, loader, engine, answerLogout, dbExists } = await menuOnDevice(2);
    await menu.clickItem({ text: REMOVE });
    const dialog = await until(async () => (await loader.getAllHarnesses(MatDialogHarness))[0], 'the warning');
    await (await dialogButton(loader, /Sync first/)).click();
    expect(engine.syncNow).toHaveBeenCalled();
    await until(async () => (await dialog.getContentText()).includes('Everything is synced'), 'the synced note');
    await (await dialogButton(loader, /^Sign out and remove$/)).click();
    await answerLogout();
    await until(async () => !(await dbExists()), 'the database to go');
  });

  it('when the user removes anyway, then the unsynced work goes with the database', async () => {
    const { menu, loader, answerLogout, dbExists } = await menuOnDevice(1);
    await menu.clickItem({ text: REMOVE });
    await until(async () => (await loader.getAllHarnesses(MatDialogHarness))[0], 'the warning');
    await (await dialogButton(loader, /Remove anyway/)).click();
    await answerLogout();
    await until(async () => !(await dbExists()), 'the database to go');
  });

  it('when the user signs out plainly, then the database and Board copies stay for their next sign-in', async () => {
    const { menu, answerLogout, dbExists, navigate, userId } = await menuOnDevice(0);
    await menu.clickItem({ text: /Sign out$/ });
    await answerLogout();
    await until(() => navigate.mock.calls.length > 0, 'sign-in to open');
    expect(await dbExists()).toBe(true);
    expect(localStorage.getItem(`fw.board.${userId}.progress.c1.all`)).toBe('{}');
  });
});
