/**
 * The pane's progress bar and Cancel button for a fit running in a worker.
 * Builds its own few elements after an anchor (the status line), so the
 * pane's layout needs no change: a bar, the stage in plain words with the
 * seconds elapsed, and Cancel.
 *
 * The bar is a plain block whose width is the share done; it does not animate
 * while the share is unknown (an animated indeterminate bar repaints every
 * frame, and on a busy machine those repaints alone show up as long tasks on
 * the page's thread). Reports are kept as they come and drawn four times a
 * second at most, inside a box whose layout is contained, so progress costs
 * the page's thread next to nothing however often the engine reports.
 */

/** One run as the pane sees it. */
export interface PaneRun {
  /** Pass to compute(): aborted by Cancel, or by the next run. */
  readonly signal: AbortSignal;
  onProgress(p: { fraction: number; stage: string }): void;
  /** True once a newer run has started (this one was cancelled for it). */
  readonly superseded: boolean;
  /** Hides the bar (call when the run ends, however it ends). */
  done(): void;
}

export class ProgressBox {
  private readonly box: HTMLDivElement;
  private readonly fill: HTMLDivElement;
  private readonly stage: HTMLSpanElement;
  private readonly cancel: HTMLButtonElement;
  private current: AbortController | null = null;
  private timer: ReturnType<typeof setInterval> | null = null;

  constructor(anchor: HTMLElement) {
    this.box = document.createElement('div');
    this.box.id = 'progress';
    this.box.hidden = true;
    this.box.style.cssText = 'display:none;align-items:center;gap:8px;margin:6px 0;height:28px;contain:layout paint style';
    const track = document.createElement('div');
    track.id = 'progress-bar';
    track.setAttribute('role', 'progressbar');
    track.setAttribute('aria-valuemin', '0');
    track.setAttribute('aria-valuemax', '100');
    track.style.cssText = 'flex:1;height:8px;border:1px solid #9aa5b1;border-radius:4px;overflow:hidden;background:#e9edf1';
    this.fill = document.createElement('div');
    this.fill.style.cssText = 'height:100%;width:0;background:#0f7c7a';
    track.append(this.fill);
    this.stage = document.createElement('span');
    this.stage.id = 'progress-stage';
    this.stage.className = 'note';
    this.stage.style.cssText = 'white-space:nowrap;overflow:hidden;text-overflow:ellipsis;max-width:55%';
    this.cancel = document.createElement('button');
    this.cancel.id = 'cancel';
    this.cancel.type = 'button';
    this.cancel.className = 'secondary';
    this.cancel.textContent = 'Cancel';
    this.cancel.onclick = () => this.current?.abort();
    this.box.append(track, this.stage, this.cancel);
    anchor.after(this.box);
  }

  /** Starts a run, cancelling the one still under way. */
  start(): PaneRun {
    this.current?.abort();
    const controller = new AbortController();
    this.current = controller;
    const t0 = Date.now();
    let stage = 'starting';
    let share: number | null = null;
    let shown = '';
    const show = () => {
      const text = `${stage} (${Math.round((Date.now() - t0) / 1000)} s)`;
      if (text !== shown) { this.stage.textContent = text; shown = text; }
      setShare(share);
    };
    let width = '';
    const setShare = (f: number | null) => {
      const wNew = f === null ? '0' : `${Math.round(100 * Math.min(1, Math.max(0, f)))}%`;
      if (wNew === width) return;
      width = wNew;
      this.fill.style.width = wNew;
      if (f === null) this.fill.parentElement!.removeAttribute('aria-valuenow');
      else this.fill.parentElement!.setAttribute('aria-valuenow', String(Math.round(100 * f)));
    };
    show();
    if (this.timer) clearInterval(this.timer);
    this.timer = setInterval(show, 250);
    this.box.hidden = false;
    this.box.style.display = 'flex';
    const box = this;
    return {
      signal: controller.signal,
      get superseded() { return box.current !== controller && box.current !== null; },
      onProgress: (p) => {
        if (box.current !== controller) return;
        share = p.fraction > 0 ? p.fraction : null;
        stage = p.stage;
      },
      done: () => {
        if (box.current !== controller) return;
        box.current = null;
        if (box.timer) clearInterval(box.timer);
        box.timer = null;
        box.box.hidden = true;
        box.box.style.display = 'none';
      },
    };
  }
}
