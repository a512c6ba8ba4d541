/**
 * Reusable buffers for the E-step and decoding of one run at a time, grown on demand and never shrunk,
 * so a long fit allocates once per worker rather than once per run.
 */
export class EStepWorkspace {
  alpha = new Float64Array(0);
  scale = new Float64Array(0);
  work = new Float64Array(0);

  /** Makes sure the buffers hold a run of `nSteps` steps over `nCells` cells; returns this. */
  ensure(nCells: number, nSteps: number): this {
    if (this.alpha.length < nCells * nSteps) this.alpha = new Float64Array(nCells * nSteps);
    if (this.scale.length < nSteps) this.scale = new Float64Array(nSteps);
    if (this.work.length < 3 * nCells) this.work = new Float64Array(3 * nCells);
    return this;
  }
}
