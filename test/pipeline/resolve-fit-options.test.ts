import { describe, it, expect } from 'vitest';
import { resolveFitOptions } from '../../src/pipeline/resolve-fit-options.js';
import { resolveCompareOptions } from '../../src/pipeline/resolve-compare-options.js';
import { parsePipeline } from '../../src/io/parse-pipeline.js';
import { InputError } from '../../src/errors.js';

describe('fit options: transition modes and the transition prior', () => {
  it('defaults to auto with transition prior strength 20', () => {
    const { options } = resolveFitOptions({}, 'fit');
    expect(options.transitions).toBe('auto');
    expect(options.transitionPriorStrength).toBe(20);
  });

  it('records the transition prior strength only for the modes that use it (fixed and tied files stay as before)', () => {
    for (const mode of ['fixed', 'tied']) expect('transitionPriorStrength' in resolveFitOptions({ transitions: mode, transitionPriorStrength: '5' }, 'fit').options).toBe(false);
    for (const mode of ['per-cell', 'learned', 'auto']) expect(resolveFitOptions({ transitions: mode, transitionPriorStrength: '5' }, 'fit').options.transitionPriorStrength).toBe(5);
  });

  it('rejects an unknown mode and a negative strength with one line naming the flag', () => {
    expect(() => resolveFitOptions({ transitions: 'smooth' }, 'fit')).toThrow(new InputError('fit: --transitions must be one of auto, fixed, tied, per-cell, learned, got "smooth"'));
    expect(() => resolveFitOptions({ transitions: 'tied', transitionPriorStrength: '-2' }, 'fit')).toThrow(/--transition-prior-strength must be a number from 0 to 1e9, got "-2"/);
  });

  it('compare keeps one mode: tied by default, auto and per-cell refused', () => {
    expect(resolveCompareOptions({}, 'compare').fit.transitions).toBe('tied');
    expect(() => resolveCompareOptions({ transitions: 'auto' }, 'compare')).toThrow(/--transitions must be one of fixed, tied, learned/);
    expect(() => resolveCompareOptions({ transitions: 'per-cell' }, 'compare')).toThrow(InputError);
  });

  it('a pipeline accepts fit.transitionPriorStrength', () => {
    const text = JSON.stringify({ format: 'underfoot-pipeline/1', floor: 'f.json', runs: ['r.csv'], fit: { transitions: 'learned', transitionPriorStrength: 50 }, out: { dir: 'o', model: 'm.json' } });
    const p = parsePipeline(text, '/x/p.json');
    expect(resolveFitOptions(p.fit as Record<string, unknown>, 'p.json', (k) => `fit.${k}`).options.transitionPriorStrength).toBe(50);
  });
});

describe('fit options: --prune', () => {
  it('is absent by default and at 0 (exact fits keep their model files), recorded when above 0', () => {
    expect('prune' in resolveFitOptions({}, 'fit').options).toBe(false);
    expect('prune' in resolveFitOptions({ prune: '0' }, 'fit').options).toBe(false);
    expect(resolveFitOptions({ prune: '1e-6' }, 'fit').options.prune).toBe(1e-6);
  });

  it('rejects values outside [0, 0.1] with one line naming the flag, and a pipeline accepts fit.prune', () => {
    expect(() => resolveFitOptions({ prune: '0.5' }, 'fit')).toThrow(new InputError('fit: --prune must be a number from 0 to 0.1, got "0.5"'));
    expect(() => resolveFitOptions({ prune: 'abc' }, 'fit')).toThrow(/--prune must be a number from 0 to 0.1, got "abc"/);
    const text = JSON.stringify({ format: 'underfoot-pipeline/1', floor: 'f.json', runs: ['r.csv'], fit: { prune: 1e-4 }, out: { dir: 'o', model: 'm.json' } });
    const p = parsePipeline(text, '/x/p.json');
    expect(resolveFitOptions(p.fit as Record<string, unknown>, 'p.json', (k) => `fit.${k}`).options.prune).toBe(1e-4);
  });
});
