import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { createWriteStream, linkSync, mkdirSync, readdirSync, readFileSync, statSync, symlinkSync, writeFileSync, lstatSync } from 'node:fs';
import { join } from 'node:path';
import { Int32, Table, Utf8, tableFromArrays, tableToIPC, vectorFromArray } from 'apache-arrow';
import { BIN, runCli, tempDir, type CliResult } from '../helpers/run-cli.js';
import { gridFloor } from '../helpers/grid-floor.js';

/**
 * Data safety through the built command: bad inputs are one line and exit 2, outputs never replace an
 * input or each other, and nothing is written when a command refuses. Every case hashes the whole
 * folder (every file's bytes) before and after the command.
 */
const floor = gridFloor(4, 3, ['oak', 'carpet', 'tile'], (x, y) => (x + 2 * y) % 3, 'data safety floor');
const tmp = tempDir('underfoot-safety-');
const p = tmp.path;

beforeAll(() => {
  writeFileSync(p('floor.json'), JSON.stringify(floor, null, 2));
  expect(runCli(['simulate', '--floor', p('floor.json'), '--runs', '12', '--steps', '60', '--seed', '3', '--out', p('runs.csv')]).code).toBe(0);
  const fit = runCli(['fit', '--floor', p('floor.json'), '--runs', p('runs.csv'), '--out', p('model.json'), '--restarts', '1', '--max-iter', '3', '--workers', '1', '--quiet']);
  expect(fit.code, fit.stderr).toBe(0);
  // A second reading column (the same readings, shifted by one row) for the checkpoint key test.
  const lines = readFileSync(p('runs.csv'), 'utf8').trimEnd().split('\n');
  const readings = lines.slice(1).map((l) => l.split(',')[2]);
  writeFileSync(p('runs2.csv'), `${[`${lines[0]},reading2`, ...lines.slice(1).map((l, i) => `${l},${readings[(i + 1) % readings.length]}`)].join('\n')}\n`);
});
afterAll(() => tmp.remove());

/** Every file (recursively) of a folder with the SHA-256 of its bytes; symlinks as their target. */
function snapshot(dir: string = tmp.dir): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (d: string, prefix: string): void => {
    for (const name of readdirSync(d).sort()) {
      const path = join(d, name);
      const st = lstatSync(path);
      if (st.isSymbolicLink()) out[prefix + name] = 'symlink';
      else if (st.isDirectory()) walk(path, `${prefix}${name}/`);
      else if (st.isFile()) out[prefix + name] = createHash('sha256').update(readFileSync(path)).digest('hex');
      else out[prefix + name] = 'special';
    }
  };
  walk(dir, '');
  return out;
}

/** Runs the command and expects one line on stderr containing every `parts`, exit 2, and no file changed or added. */
function refuses(args: string[], ...parts: string[]): CliResult {
  const before = snapshot();
  const r = runCli(args, tmp.dir);
  expect(r.code, r.stderr).toBe(2);
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines, r.stderr).toHaveLength(1);
  expect(lines[0].startsWith('underfoot: ')).toBe(true);
  for (const part of parts) expect(lines[0]).toContain(part);
  expect(r.stderr).not.toMatch(/internal error| {4}at /);
  expect(snapshot()).toEqual(before);
  return r;
}

const modelText = (): string => readFileSync(p('model.json'), 'utf8');
const pipeline = (doc: Record<string, unknown>): Record<string, unknown> => ({
  format: 'underfoot-pipeline/1',
  floor: 'floor.json',
  runs: ['runs.csv'],
  fit: { restarts: 1, maxIter: 2, workers: 1 },
  ...doc,
});

describe('every JSON input goes through one reader: repeated keys and bad UTF-8 are one line, exit 2', () => {
  const badUtf8 = (text: string): Buffer => {
    const bytes = Buffer.from(text, 'utf8');
    const at = bytes.indexOf(Buffer.from('"name"')) + 2; // inside the key
    bytes[at] = 0xff;
    return bytes;
  };

  it('floor: a key given twice', () => {
    writeFileSync(p('dup-floor.json'), JSON.stringify(floor).replace('"name":', '"name":"first","name":'));
    refuses(['check', '--floor', 'dup-floor.json'], 'dup-floor.json', 'must name a key once', '"name" twice');
  });
  it('floor: a byte that is not UTF-8', () => {
    writeFileSync(p('bad-floor.json'), badUtf8(JSON.stringify(floor)));
    refuses(['check', '--floor', 'bad-floor.json'], 'bad-floor.json', 'must be UTF-8 text');
  });
  it('model: a key given twice (JSON.parse would keep the last silently)', () => {
    writeFileSync(p('dup-model.json'), modelText().replace('"name":', '"name": "first", "name":'));
    refuses(['decode', '--model', 'dup-model.json', '--runs', 'runs.csv', '--out', 'a.csv'], 'dup-model.json', 'must name a key once');
  });
  it('model: a byte that is not UTF-8', () => {
    writeFileSync(p('bad-model.json'), badUtf8(modelText()));
    refuses(['decode', '--model', 'bad-model.json', '--runs', 'runs.csv', '--out', 'a.csv'], 'bad-model.json', 'must be UTF-8 text');
  });
  it('pipeline: a key given twice', () => {
    writeFileSync(p('dup-pipeline.json'), JSON.stringify(pipeline({ out: { dir: 'out-dup', model: 'm.json' } })).replace('"floor":', '"floor":"x.json","floor":'));
    refuses(['run', 'dup-pipeline.json'], 'dup-pipeline.json', 'must name a key once');
  });
  it('pipeline: a byte that is not UTF-8', () => {
    writeFileSync(p('bad-pipeline.json'), badUtf8(JSON.stringify({ name: 'x', ...pipeline({ out: { dir: 'out-bad', model: 'm.json' } }) })));
    refuses(['run', 'bad-pipeline.json'], 'bad-pipeline.json', 'must be UTF-8 text');
  });
  it('checkpoint: a key given twice, and a byte that is not UTF-8', () => {
    mkdirSync(p('cp-dup'));
    writeFileSync(p('cp-dup/fit-checkpoint.json'), '{"format":"underfoot-fit-checkpoint/1","key":"a","key":"b","done":[],"current":null}');
    const args = ['fit', '--floor', 'floor.json', '--runs', 'runs.csv', '--out', 'cp.json', '--restarts', '1', '--max-iter', '2', '--workers', '1', '--quiet', '--checkpoint', 'cp-dup'];
    refuses(args, 'fit-checkpoint.json', 'must name a key once', 'remove the checkpoint');
    writeFileSync(p('cp-dup/fit-checkpoint.json'), Buffer.from([0x7b, 0x22, 0xc3, 0x28, 0x22, 0x3a, 0x31, 0x7d]));
    refuses(args, 'fit-checkpoint.json', 'must be UTF-8 text');
  });
  it('nesting deeper than 64 levels is refused with its line and column', () => {
    writeFileSync(p('deep-floor.json'), `{"name":${'['.repeat(70)}${']'.repeat(70)}}`);
    refuses(['check', '--floor', 'deep-floor.json'], 'deep-floor.json', 'nesting deeper than 64 levels', 'line 1');
  });
});

describe('input files: size cap, endless streams, damaged values', () => {
  it('--floor /dev/zero is refused at the 256 MiB cap instead of growing until killed', () => {
    refuses(['check', '--floor', '/dev/zero'], '/dev/zero', 'must be at most 256 MiB');
  });

  it('a FIFO that never ends is refused at the cap', async () => {
    const fifo = p('endless.fifo');
    expect(spawnSync('mkfifo', [fifo]).status).toBe(0);
    const before = snapshot();
    const child = spawn(process.execPath, [BIN, 'check', '--floor', fifo], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    const writer = createWriteStream(fifo);
    const chunk = Buffer.alloc(1 << 20, 0x20);
    let open = true;
    writer.on('error', () => (open = false)); // EPIPE once the command stops reading
    const pump = (): void => {
      while (open && writer.write(chunk));
      if (open) writer.once('drain', pump);
    };
    pump();
    const code = await new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
    open = false;
    writer.destroy();
    expect(code).toBe(2);
    expect(stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(stderr).toContain('must be at most 256 MiB');
    expect(snapshot()).toEqual(before);
  }, 60_000);

  it('fit --runs <a FIFO> reads it once: the digest comes from the bytes read (opening it again would block)', () => {
    const fifo = p('runs.fifo.csv');
    expect(spawnSync('mkfifo', [fifo]).status).toBe(0);
    const writer = spawn('sh', ['-c', 'cat runs.csv > runs.fifo.csv'], { cwd: tmp.dir, stdio: 'ignore' });
    const r = spawnSync(process.execPath, [BIN, 'fit', '--floor', 'floor.json', '--runs', 'runs.fifo.csv', '--out', 'fifo-model.json', '--restarts', '1', '--max-iter', '2', '--workers', '1', '--quiet'], {
      cwd: tmp.dir,
      encoding: 'utf8',
      timeout: 60_000,
    });
    writer.kill();
    expect(r.status, r.stderr).toBe(0);
    const digest = createHash('sha256').update(readFileSync(p('runs.csv'))).digest('hex');
    expect(JSON.parse(readFileSync(p('fifo-model.json'), 'utf8')).fit.runsDigests).toEqual([{ file: 'runs.fifo.csv', sha256: `sha256:${digest}` }]);
  }, 90_000);

  it('a model with "fit": {} is refused at read time', () => {
    const doc = JSON.parse(modelText());
    doc.fit = {};
    writeFileSync(p('empty-fit.json'), JSON.stringify(doc));
    refuses(['decode', '--model', 'empty-fit.json', '--runs', 'runs.csv', '--out', 'a.csv'], 'empty-fit.json: fit.tool must be a string');
  });

  it('a model whose fit record has a wrong type deep inside is refused naming the field', () => {
    const doc = JSON.parse(modelText());
    doc.fit.restarts[0].history = ['x'];
    writeFileSync(p('bad-history.json'), JSON.stringify(doc));
    refuses(['report', '--model', 'bad-history.json', '--out', 'r.html'], 'fit.restarts[0].history[0] must be a finite number');
  });

  it('a model with coordinates of 1e160 metres is refused (the report would overflow)', () => {
    const doc = JSON.parse(modelText());
    doc.cells[0].x = 1e160;
    writeFileSync(p('far-model.json'), JSON.stringify(doc));
    refuses(['report', '--model', 'far-model.json', '--out', 'r.html'], 'far-model.json', '"x" must be a finite number of metres within');
    const f = structuredClone(floor);
    f.cells[1].y = -1e160;
    writeFileSync(p('far-floor.json'), JSON.stringify(f));
    refuses(['check', '--floor', 'far-floor.json'], 'far-floor.json', '"y" must be a finite number of metres within');
  });

  it('a floor cell id with a lone surrogate is refused (it could not be written as UTF-8)', () => {
    writeFileSync(p('surrogate-floor.json'), JSON.stringify(floor).replace('"g-0-0"', '"g-0-0\\ud800"').replace('"g-0-0"', '"g-0-0\\ud800"'));
    refuses(['check', '--floor', 'surrogate-floor.json'], 'surrogate-floor.json', 'well-formed Unicode', 'lone surrogate');
  });

  it('an Arrow run id whose bytes are not UTF-8 is one line naming the column and row', () => {
    const table = new Table({
      run: vectorFromArray(['r1', 'r1', 'r2', 'r2'], new Utf8()),
      step: vectorFromArray([0, 1, 0, 1], new Int32()),
      reading: vectorFromArray(['oak', 'tile', 'oak', 'carpet'], new Utf8()),
    });
    const bytes = Buffer.from(tableToIPC(table, 'file'));
    const at = bytes.indexOf(Buffer.from('r1r1r2r2'));
    expect(at).toBeGreaterThan(0);
    bytes[at + 5] = 0xff; // the third row's id: "r\xff"
    writeFileSync(p('bad-ids.arrow'), bytes);
    refuses(['check', '--floor', 'floor.json', '--runs', 'bad-ids.arrow'], 'bad-ids.arrow', 'column "run" at row 3 must be UTF-8 text');
  });

  it('a dictionary-encoded Arrow reading whose bytes are not UTF-8 is one line naming the column and row', () => {
    const table = tableFromArrays({ run: ['r1', 'r1', 'r1'], step: Int32Array.from([0, 1, 2]), reading: ['oak', 'tile', 'oak'] });
    const bytes = Buffer.from(tableToIPC(table, 'file'));
    const at = bytes.indexOf(Buffer.from('oaktile'));
    expect(at).toBeGreaterThan(0);
    bytes[at + 4] = 0xc3; // "tile" becomes "t\xc3le": a lead byte without its continuation
    writeFileSync(p('bad-dict.arrow'), bytes);
    refuses(['check', '--floor', 'floor.json', '--runs', 'bad-dict.arrow'], 'bad-dict.arrow', 'column "reading" at row 2 must be UTF-8 text');
  });

  it('an Arrow stream cut at a record-batch boundary is refused, naming the rows it holds', () => {
    const batch = (run: string) =>
      new Table({
        run: vectorFromArray([run, run, run], new Utf8()),
        step: vectorFromArray([0, 1, 2], new Int32()),
        reading: vectorFromArray(['oak', 'tile', 'carpet'], new Utf8()),
      }).batches[0];
    const streamOf = (runs: string[]): Uint8Array => tableToIPC(new Table(runs.map(batch)), 'stream');
    const whole = streamOf(['r1', 'r2', 'r3']);
    const first = streamOf(['r1']);
    // The one-batch stream without its end-of-stream marker is a prefix of the three-batch stream.
    const cut = first.length - 8;
    expect(Buffer.from(whole.subarray(0, cut)).equals(Buffer.from(first.subarray(0, cut)))).toBe(true);
    writeFileSync(p('whole.arrows'), whole);
    expect(runCli(['check', '--floor', 'floor.json', '--runs', 'whole.arrows', '--json'], tmp.dir).code).toBe(0);
    writeFileSync(p('cut.arrows'), whole.subarray(0, cut));
    refuses(['check', '--floor', 'floor.json', '--runs', 'cut.arrows'], 'cut.arrows', 'must end with its end-of-stream marker', '1 record batch(es), 3 rows');
  });
});

describe('outputs never replace inputs or each other; refused before any work', () => {
  const fitArgs = (out: string) => ['fit', '--floor', 'floor.json', '--runs', 'runs.csv', '--out', out, '--restarts', '1', '--max-iter', '2', '--workers', '1', '--quiet'];
  const decodeArgs = (...extra: string[]) => ['decode', '--model', 'model.json', '--runs', 'runs.csv', ...extra];

  it('fit --out <the runs table>', () => refuses(fitArgs('runs.csv'), 'fit: --out must not name an input', '--runs'));
  it('fit --out <the floor>, written as ./sub/../floor.json', () => {
    mkdirSync(p('sub'), { recursive: true });
    refuses(fitArgs('./sub/../floor.json'), '--out must not name an input', '--floor');
  });
  it('decode --summary <the runs table>', () => refuses(decodeArgs('--out', 'a.csv', '--summary', 'runs.csv'), 'decode: --summary must not name an input'));
  it('decode --out X --summary X (the same file twice, spelt differently)', () =>
    refuses(decodeArgs('--out', 'x.csv', '--summary', `../${tmp.dir.split('/').pop()}/x.csv`), '--summary must differ from every other output', '--out'));
  it('decode --out <a hard link to the runs table>', () => {
    linkSync(p('runs.csv'), p('hard-link.csv'));
    refuses(decodeArgs('--out', 'hard-link.csv'), '--out must not name an input', '--runs');
  });
  it('decode --out <a symlink to the model>', () => {
    symlinkSync(p('model.json'), p('model-link.csv'));
    refuses(decodeArgs('--out', 'model-link.csv'), '--out must not name an input', '--model');
  });
  it('compare --out <a runs table>', () =>
    refuses(['compare', '--model', 'model.json', '--floor', 'floor.json', '--runs', 'runs.csv', '--out', 'runs.csv', '--workers', '1'], 'compare: --out must not name an input'));
  it('compare --refit <the old model>', () =>
    refuses(['compare', '--model', 'model.json', '--floor', 'floor.json', '--runs', 'runs.csv', '--out', 'c.csv', '--refit', 'model.json', '--workers', '1'], '--refit must not name an input'));
  it('report --out <its own --summary input> is refused', () => {
    writeFileSync(p('summary.html'), 'not really a table\n');
    refuses(['report', '--model', 'model.json', '--summary', 'summary.html', '--out', 'summary.html'], '--out must not name an input', '--summary');
  });
  it('--out /dev/null is refused before any write, and /dev/null stays a character device', () => {
    refuses(fitArgs('/dev/null'), '--out must be a regular file or a new file path', 'a character device');
    refuses(['compare', '--model', 'model.json', '--floor', 'floor.json', '--runs', 'runs.csv', '--out', 'c.csv', '--refit', '/dev/null', '--workers', '1'], '--refit must be a regular file or a new file path');
    expect(statSync('/dev/null').isCharacterDevice()).toBe(true);
  });
  it('an output that is a folder or a FIFO is refused', () => {
    mkdirSync(p('folder.csv'), { recursive: true });
    refuses(decodeArgs('--out', 'folder.csv'), '--out must be a regular file', 'a folder');
    expect(spawnSync('mkfifo', [p('pipe.csv')]).status).toBe(0);
    refuses(decodeArgs('--out', 'pipe.csv'), '--out must be a regular file', 'a FIFO');
  });
  it('decode --out a.csv --summary s.txt refuses before writing a.csv', () =>
    refuses(decodeArgs('--out', 'a.csv', '--summary', 's.txt'), 's.txt: extension must be one of'));
  it('fit --prior-strength 1e308 is refused before the fit (it overflowed after it)', () =>
    refuses([...fitArgs('m.json'), '--prior-strength', '1e308'], '--prior-strength must be a number from 0 to 1e9'));
  it('simulate --out <the floor>', () =>
    refuses(['simulate', '--floor', 'floor.json', '--runs', '1', '--steps', '2', '--seed', '1', '--out', 'floor.json'], 'floor.json: extension must be one of'));
  it('simulate with more rows than it may write is refused before simulating', () => {
    refuses(['simulate', '--floor', 'floor.json', '--runs', '1000000', '--steps', '1000', '--seed', '1', '--out', 'big.csv'], '--runs × --steps must be at most');
  });
});

describe('pipelines: every output inside out.dir, with its extension, replacing no input; checked before anything is read', () => {
  const runPipeline = (name: string, doc: Record<string, unknown>, ...parts: string[]): void => {
    writeFileSync(p(name), JSON.stringify(doc));
    refuses(['run', name], name, ...parts);
  };
  it('an absolute out entry', () => runPipeline('abs.json', pipeline({ out: { dir: 'po', model: p('abs-model.json') } }), '"out.model" must be a file name inside "out.dir"'));
  it('an out entry leading out of out.dir with ".."', () => runPipeline('dots.json', pipeline({ out: { dir: 'po', model: '../escaped.json' } }), '"out.model" must be a file name inside "out.dir"'));
  it('an out entry with an extension the tool does not write for it', () =>
    runPipeline('ext.json', pipeline({ out: { dir: 'po', model: 'm.json', annotated: 'a.json' } }), '"out.annotated" must end in .csv, .arrow, .feather, .arrows'));
  it('out.dir is the input folder and out.summary is the runs table', () =>
    runPipeline('over-runs.json', pipeline({ out: { dir: '.', model: 'm-new.json', summary: 'runs.csv' } }), '"out.summary" must not name an input', '"runs"'));
  it('out.model is the floor', () => runPipeline('over-floor.json', pipeline({ out: { dir: '.', model: 'floor.json' } }), '"out.model" must not name an input', '"floor"'));
  it('out.model is the pipeline file itself', () => runPipeline('self.json', pipeline({ out: { dir: '.', model: 'self.json' } }), '"out.model" must not name an input', 'the pipeline file'));
  it('two outputs are the same file', () =>
    runPipeline('twice.json', pipeline({ out: { dir: 'po', model: 'm.json', annotated: 'x.csv', summary: 'x.csv' } }), '"out.summary" must differ from every other output'));
  it('an annotated table named like the model (.json) is refused by its extension', () =>
    runPipeline('decode-over.json', { format: 'underfoot-pipeline/1', floor: 'floor.json', runs: 'runs.csv', model: 'model.json', out: { dir: '.', annotated: 'model.json' } }, '"out.annotated" must end in'));
});

describe('checkpoints: the key covers every option that changes what is read; damaged content is refused', () => {
  const fitArgs = (runsCol: string[], extra: string[] = []) => [
    BIN, 'fit', '--floor', 'floor.json', '--runs', 'runs2.csv', '--out', 'cp-model.json', '--restarts', '3', '--max-iter', '400', '--tol', '0',
    '--workers', '1', '--quiet', '--checkpoint', 'cp', ...runsCol, ...extra,
  ].map((a) => (a === '400' ? '5000' : a));

  it('SIGTERM stops the fit cleanly (exit 143) with the checkpoint complete; resuming with another --reading-col is refused', async () => {
    const child = spawn(process.execPath, fitArgs([]), { cwd: tmp.dir, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    const poll = setInterval(() => {
      try {
        const cp = JSON.parse(readFileSync(p('cp/fit-checkpoint.json'), 'utf8'));
        if (cp.current && cp.current.iterations >= 3) {
          clearInterval(poll);
          child.kill('SIGTERM');
        }
      } catch {
        /* not written yet */
      }
    }, 5);
    const code = await new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
    clearInterval(poll);
    expect(code, stderr).toBe(143);
    expect(stderr.trimEnd().split('\n')).toHaveLength(1);
    expect(stderr).toContain('fit interrupted (SIGTERM); the checkpoint in cp is complete: run the same command again to resume');
    expect(readdirSync(p('cp')).filter((f) => f.includes('.tmp-'))).toEqual([]);
    refuses(fitArgs(['--reading-col', 'reading2']).slice(1), 'fit-checkpoint.json', 'must have been made by the same fit');
    refuses(fitArgs(['--unknown-readings', 'dropout']).slice(1), 'must have been made by the same fit');
  }, 60_000);

  it('a hand-edited checkpoint (a wrong type, a row not summing to 1, wrong sizes) is one line naming it', () => {
    const file = p('cp/fit-checkpoint.json');
    const original = readFileSync(file, 'utf8');
    // The fit may have stopped between two restarts (no loop in progress): make one from a finished restart.
    const base = JSON.parse(original);
    if (!base.current) {
      const last = base.done[base.done.length - 1];
      base.current = base.done.length < 3
        ? { phase: 'restart', index: base.done.length, iterations: 1, history: [last.record.history[0]], params: last.params }
        : { phase: 'final', index: 0, iterations: 1, history: [last.record.history[0]], params: last.params };
    }
    const edit = (change: (cp: Record<string, any>) => void, ...parts: string[]): void => {
      const cp = structuredClone(base);
      change(cp);
      writeFileSync(file, JSON.stringify(cp));
      refuses(fitArgs([]).slice(1), 'fit-checkpoint.json', ...parts);
    };
    edit((cp) => (cp.current.params.emission[0] = 'x'), 'current.params.emission[0] must be a probability in [0, 1], got "x"');
    edit((cp) => (cp.current.params.emission[0] = 0.999), 'current.params.emission (row of cell "g-0-0") must sum to 1');
    edit((cp) => cp.current.params.start.pop(), 'current.params.start must hold 12 numbers for this floor, got 11');
    edit((cp) => (cp.done.length ? (cp.done[0].record.stopReason = 'tired') : (cp.current.phase = 'tired')), base.done.length ? 'done[0].record.stopReason must be one of' : 'current.phase must be');
    edit((cp) => (cp.current.history = []), 'current.history must hold one objective per iteration');
    writeFileSync(file, original);
  });
});

describe('signals and pipes', () => {
  it.each([
    ['SIGINT', 130],
    ['SIGTERM', 143],
  ] as const)('%s while a large table is being written: status %i (ended by the signal), the old file stays, no temporary file is left', async (signal, exitCode) => {
    const out = p('big.csv');
    writeFileSync(out, 'the previous result\n');
    const child = spawn(process.execPath, [BIN, 'simulate', '--floor', 'floor.json', '--runs', '2000', '--steps', '1000', '--seed', '2', '--out', 'big.csv'], {
      cwd: tmp.dir,
      stdio: ['ignore', 'ignore', 'pipe'],
    });
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    let sent = false;
    const poll = setInterval(() => {
      if (!sent && readdirSync(tmp.dir).some((f) => f.startsWith('big.csv.tmp-'))) {
        sent = true;
        child.kill(signal);
      }
    }, 1);
    const [code, bySignal] = await new Promise<[number | null, NodeJS.Signals | null]>((resolve) => child.on('exit', (c, sig) => resolve([c, sig])));
    clearInterval(poll);
    expect(sent).toBe(true);
    // The process dies of the signal itself, which a shell reports as 128 + its number (130, 143).
    expect([code, bySignal]).toEqual([null, signal]);
    expect(stderr.trim()).toBe(`underfoot: stopped by ${signal}; outputs not finished were not written (exit ${exitCode})`);
    expect(readFileSync(out, 'utf8')).toBe('the previous result\n');
    expect(readdirSync(tmp.dir).filter((f) => f.includes('.tmp-'))).toEqual([]);
  }, 60_000);

  it('SIGTERM ends a command blocked opening a FIFO that nobody writes (no hang in the exit)', async () => {
    const fifo = p('silent.fifo.csv');
    expect(spawnSync('mkfifo', [fifo]).status).toBe(0);
    const child = spawn(process.execPath, [BIN, 'check', '--floor', 'floor.json', '--runs', 'silent.fifo.csv'], { cwd: tmp.dir, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    await new Promise((r) => setTimeout(r, 1500)); // started and blocked in open()
    child.kill('SIGTERM');
    const ended = await new Promise<[number | null, NodeJS.Signals | null] | 'hung'>((resolve) => {
      const timer = setTimeout(() => resolve('hung'), 15_000);
      child.on('exit', (c, sig) => {
        clearTimeout(timer);
        resolve([c, sig]);
      });
    });
    if (ended === 'hung') child.kill('SIGKILL');
    expect(ended).toEqual([null, 'SIGTERM']);
    expect(stderr.trim()).toBe('underfoot: stopped by SIGTERM; outputs not finished were not written (exit 143)');
  }, 30_000);

  it('check --json into a pipe that is already closed (as `| head -c 10`) ends quietly: no stack trace, exit 0', async () => {
    const child = spawn(process.execPath, [BIN, 'check', '--floor', 'floor.json', '--runs', 'runs.csv', '--json'], { cwd: tmp.dir, stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    // Close the reading end before the command writes, so its write meets EPIPE.
    child.stdout.destroy();
    const code = await new Promise<number | null>((resolve) => child.on('exit', (c) => resolve(c)));
    expect(stderr).toBe('');
    expect(code).toBe(0);
  });
});
