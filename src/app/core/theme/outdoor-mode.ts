import { DOCUMENT, Injectable, effect, inject, signal } from '@angular/core';
import { DeviceMemory } from '../device/device-memory';

const KEY = 'fw.outdoor';

/** The high-contrast outdoor theme, toggled from the user menu and remembered on the device. */
@Injectable({ providedIn: 'root' })
export class OutdoorMode {
  private readonly memory = inject(DeviceMemory);
  private readonly document = inject(DOCUMENT);
  private readonly state = signal(this.memory.read(KEY) === true);
  readonly enabled = this.state.asReadonly();

  constructor() {
    // Drives the page's root class (the DOM outside any template).
    effect(() => this.document.documentElement.classList.toggle('fw-outdoor', this.state()));
  }

  toggle(): void {
    this.set(!this.state());
  }

  set(on: boolean): void {
    this.state.set(on);
    this.memory.write(KEY, on);
  }
}
