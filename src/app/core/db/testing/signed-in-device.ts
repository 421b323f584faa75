import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import type { EnvironmentProviders, Provider } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { localDay } from '../../../../../shared/time/site-time';
import type { FluxDb } from '../db-schema';
import { DeviceDb } from '../device-db';
import { until } from './until';

export const TEST_SITE = '11111111-1111-4111-8111-111111111111';
let userNo = 0;

/**
 * A crew member signed in on this (test) device: a session as the sign-in screen stores it, a
 * TestBed with HTTP faked, and that user's own fresh device database (a new user each call, so
 * tests never share data). Extra providers replace the default empty router when given.
 */
export async function signedInDevice(
  providers: (Provider | EnvironmentProviders)[] = [provideRouter([])],
  site: { timezone?: string } = {},
): Promise<{ db: FluxDb; userId: string }> {
  const userId = `${String(++userNo).padStart(8, '0')}-0000-4000-8000-0000000000ee`;
  localStorage.setItem(
    'fw.session',
    JSON.stringify({
      user: { id: userId, email: 'crew@fluxwalk.example', displayName: 'Crew', roles: ['crew'], siteIds: [TEST_SITE] },
      sites: [{ id: TEST_SITE, name: 'Test site', ...site }],
    }),
  );
  TestBed.configureTestingModule({ providers: [...providers, provideHttpClient(), provideHttpClientTesting()] });
  const db = await until(() => TestBed.inject(DeviceDb).db(), 'the database');
  return { db, userId };
}

/**
 * A real zone whose calendar day differs from the device's right now (the far east or west of
 * the date line), so a test of "the site's today" fails on any device whose day is used instead.
 */
export function zoneAwayFromDevice(now = new Date()): { zone: string; deviceDay: string } {
  const deviceDay = `${now.getFullYear()}-${String(now.getMonth() + 1).padStart(2, '0')}-${String(now.getDate()).padStart(2, '0')}`;
  const zone = ['Pacific/Kiritimati', 'Pacific/Pago_Pago', 'Pacific/Auckland', 'Pacific/Honolulu'].find(
    (z) => localDay(now, z) !== deviceDay,
  )!;
  return { zone, deviceDay };
}
