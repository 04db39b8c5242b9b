/** Runs the stages of one target or setup in order, timing each and announcing it as an event. */
import type { Diagnostic } from '../../diagnostics.js';
import type { StageResult } from '../../products/frame.js';
import type { EventSink } from '../events.js';

export class StageTimer {
  /** Wall time per stage, milliseconds, in the order the stages ran. */
  readonly ms: Record<string, number> = {};
  readonly diagnostics: Diagnostic[] = [];
  /** Peak of V8 heap plus array buffers seen at stage boundaries, MB (this thread only). */
  peakMemoryMb = 0;
  private index = 0;

  constructor(
    private readonly owner: { target?: string; setup?: string },
    private readonly total: number,
    private readonly emit: EventSink,
    /** Seconds since the run began, for event times. */
    private readonly now: () => number,
  ) {}

  /** Run a step that returns a plain value. */
  step<T>(stage: string, fn: () => T): T {
    this.emit({ type: 'stage', t: this.now(), ...this.owner, stage, index: this.index++, total: this.total });
    const start = performance.now();
    try {
      return fn();
    } finally {
      this.ms[stage] = (this.ms[stage] ?? 0) + (performance.now() - start);
      this.sampleMemory();
    }
  }

  /** Run a stage that returns a StageResult; its diagnostics are kept. */
  stage<T>(stage: string, fn: () => StageResult<T>): T {
    const r = this.step(stage, fn);
    this.diagnostics.push(...r.diagnostics);
    return r.product;
  }

  get stagesRun(): string[] {
    return Object.keys(this.ms);
  }

  private sampleMemory(): void {
    const m = process.memoryUsage();
    this.peakMemoryMb = Math.max(this.peakMemoryMb, (m.heapUsed + m.arrayBuffers) / 1048576);
  }
}
