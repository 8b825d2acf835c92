import type { HostEvent } from '../../shared-core/api.js';

/** The host's outgoing events (job progress, menu commands, files that arrived), fanned out to each transport. */
export class HostEvents {
  private readonly listeners = new Set<(event: HostEvent) => void>();

  subscribe(listener: (event: HostEvent) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  publish(event: HostEvent): void {
    for (const listener of [...this.listeners]) {
      try {
        listener(event);
      } catch {
        // A closed window or dropped connection must not stop the others from hearing.
      }
    }
  }
}
