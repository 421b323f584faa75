import { BreakpointObserver } from '@angular/cdk/layout';
import { Signal, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { map } from 'rxjs';

/** Below this width a screen is laid out for a phone: panels fold, tables turn into cards or scroll in their own box. */
export const PHONE_MAX_WIDTH_PX = 599.98;

/** Whether the window is phone-narrow now (follows rotation and resizing); call in an injection context. */
export function narrowScreen(): Signal<boolean> {
  const query = `(max-width: ${PHONE_MAX_WIDTH_PX}px)`;
  const observer = inject(BreakpointObserver);
  return toSignal(observer.observe(query).pipe(map((s) => s.matches)), { initialValue: observer.isMatched(query) });
}
