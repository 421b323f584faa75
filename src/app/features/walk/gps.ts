import { Injectable, signal } from '@angular/core';
import { bearing } from '@turf/bearing';
import { distance } from '@turf/distance';

export interface Fix {
  latitude: number;
  longitude: number;
  accuracyM: number;
  at: number;
}

/**
 * The device's position while a Walk screen wants it. GPS under canopy is off by metres, so the
 * position only guides the walk; a collar is opened by tap, code or tag.
 */
@Injectable({ providedIn: 'root' })
export class Gps {
  private readonly last = signal<Fix | null>(null);
  readonly fix = this.last.asReadonly();
  private readonly problem = signal('');
  readonly error = this.problem.asReadonly();
  private watchId: number | null = null;
  private users = 0;
  private permissionWatched = false;

  /** Starts watching; call the returned function to stop (the watch ends when no screen wants it). */
  watch(): () => void {
    this.users++;
    this.start();
    return () => {
      this.users--;
      if (this.users <= 0 && this.watchId !== null) {
        navigator.geolocation.clearWatch(this.watchId);
        this.watchId = null;
        this.users = 0;
      }
    };
  }

  private start(): void {
    if (this.watchId !== null || typeof navigator === 'undefined' || !navigator.geolocation) return;
    this.watchId = navigator.geolocation.watchPosition(
      (p) => {
        this.problem.set('');
        this.last.set({ latitude: p.coords.latitude, longitude: p.coords.longitude, accuracyM: p.coords.accuracy, at: p.timestamp });
      },
      (e) => {
        if (e.code !== e.PERMISSION_DENIED) {
          this.problem.set('No position yet: under canopy this can take a minute.');
          return;
        }
        this.problem.set(LOCATION_BLOCKED);
        // A denied watch never recovers on its own: wait for the permission to change, then watch again.
        if (this.watchId !== null) navigator.geolocation.clearWatch(this.watchId);
        this.watchId = null;
        this.followPermission();
      },
      { enableHighAccuracy: true, maximumAge: 5000, timeout: 30000 },
    );
  }

  /** Where the Permissions API exists, a grant made in the browser's settings restarts the watch. */
  private followPermission(): void {
    if (this.permissionWatched || !navigator.permissions?.query) return;
    this.permissionWatched = true;
    navigator.permissions
      .query({ name: 'geolocation' })
      .then((status) => {
        status.addEventListener('change', () => {
          if (status.state !== 'granted' || this.users <= 0) return;
          this.problem.set('');
          this.start();
        });
      })
      .catch(() => {
        this.permissionWatched = false;
      });
  }
}

export const LOCATION_BLOCKED =
  "Location is blocked for Fluxwalk. Allow it in the browser's site settings (the icon left of the address, then Permissions → Location); the position comes back here by itself. Collars still open by tap, code or tag.";

const COMPASS = ['N', 'NE', 'E', 'SE', 'S', 'SW', 'W', 'NW'];

/** Distance (m) and compass bearing from the device to a collar, via turf (great-circle). */
export function wayTo(
  from: Fix | null,
  lat: number | null,
  lon: number | null,
): { metres: number; degrees: number; compass: string } | null {
  if (!from || lat === null || lon === null) return null;
  const a: [number, number] = [from.longitude, from.latitude];
  const b: [number, number] = [lon, lat];
  const metres = distance(a, b, { units: 'meters' });
  const degrees = (bearing(a, b) + 360) % 360;
  return { metres, degrees, compass: COMPASS[Math.round(degrees / 45) % 8] };
}

/**
 * Averages several fixes into one position, each weighted by 1/accuracy² (inverse-variance
 * weighting, common practice for repeated GNSS fixes); the reported accuracy is the combined
 * standard error, never better than half the best single fix (fixes close in time are correlated).
 */
export function averageFixes(fixes: readonly Fix[]): { latitude: number; longitude: number; accuracyM: number } | null {
  if (!fixes.length) return null;
  let w = 0;
  let lat = 0;
  let lon = 0;
  for (const f of fixes) {
    const wi = 1 / Math.max(0.5, f.accuracyM) ** 2;
    w += wi;
    lat += wi * f.latitude;
    lon += wi * f.longitude;
  }
  const best = Math.min(...fixes.map((f) => f.accuracyM));
  return { latitude: lat / w, longitude: lon / w, accuracyM: Math.max(best / 2, 1 / Math.sqrt(w)) };
}
