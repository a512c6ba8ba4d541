import type { Command } from 'commander';
import { checkInputs, type CheckReport } from '../pipeline/check-inputs.js';
import { addKeyColumnOptions, addOutputOptions, keyColumnsFrom } from './common-options.js';
import type { CliIo } from './cli-io.js';
import { formatTable } from './format-table.js';

export function registerCheck(program: Command, io: CliIo): void {
  const cmd = program
    .command('check')
    .description('validate a floor file (and runs tables) and print a summary')
    .requiredOption('--floor <file>', 'floor file (underfoot-floor/1 JSON)')
    .option('--runs <files...>', 'runs tables (.csv, .arrow, .feather, .arrows)', []);
  addKeyColumnOptions(cmd);
  addOutputOptions(cmd);
  cmd.action(async (opts: Record<string, unknown>) => {
    const report = await checkInputs(String(opts.floor), opts.runs as string[], keyColumnsFrom(opts, 'check'));
    io.out(opts.json ? `${JSON.stringify(report, null, 2)}\n` : formatCheck(report));
  });
}

/** The human-readable `check` summary: figures first, warnings last. */
export function formatCheck(r: CheckReport): string {
  const f = r.floor;
  const lines: string[] = [];
  lines.push(`${r.name}  (${r.floorFile})`);
  lines.push(
    `  floor   ${f.nCells} cells · ${f.nLinks} links (${f.nDirectedLinks} directed moves) · levels ${f.levels.join(', ')} · ${f.parts} connected part${f.parts === 1 ? '' : 's'} · ${r.nStartCells ? `${r.nStartCells} start cells` : 'runs may start anywhere'}`,
  );
  if (f.unreachable.length) lines.push(`          ${f.unreachable.length} cells unreachable from the start cells`);
  if (r.georeference) {
    const g = r.georeference;
    lines.push(`          origin at ${g.lat}° lat, ${g.lon}° lon (WGS 84), x axis bearing ${g.bearing}° from north`);
  }
  lines.push('');
  const surfaces = Object.keys(f.surfaceCounts);
  const rows: Array<Array<string | number>> = surfaces.map((s) => [s, f.surfaceCounts[s], r.runs ? r.runs.readingCounts[s] : '']);
  lines.push(
    formatTable(['surface', 'cells', r.runs ? 'readings' : ''], rows)
      .trimEnd()
      .split('\n')
      .map((l) => `  ${l}`)
      .join('\n'),
  );
  if (f.zones.length) {
    // Zones as a wrapped list (a building has many): name, cell count, and how many parts when split.
    const items = f.zones.map((z) => `${z.zone} (${z.cells}${z.parts > 1 ? `, ${z.parts} parts` : ''})`);
    if (f.unzonedCells) items.push(`no zone (${f.unzonedCells}, each its own area)`);
    lines.push('');
    let line = `  zones   ${f.zones.length} zone${f.zones.length === 1 ? '' : 's'} (cell counts):`;
    for (const item of items) {
      if (line.length + item.length + 3 > 100) {
        lines.push(line);
        line = '         ';
      }
      line += line.endsWith(':') || line.trim() === '' ? ` ${item}` : ` · ${item}`;
    }
    lines.push(line);
  }
  if (r.runs) {
    const u = r.runs;
    lines.push('');
    lines.push(`  runs    ${u.runs} runs in ${u.files.length} file${u.files.length === 1 ? '' : 's'} · ${u.steps} steps (${u.rows} rows) · run length ${u.shortestRun}–${u.longestRun}`);
    lines.push(`          ${u.dropouts} dropouts · ${u.gapSteps} missing steps (gaps)${u.unknownReadings ? ` · ${u.unknownReadings} unknown readings turned into dropouts` : ''}`);
    if (u.odometry) {
      const o = u.odometry;
      const parts = [o.movedCol ? `${o.movedCol}: distance known at ${o.knownDistance} of ${o.transitions} steps` : 'no distance column', o.headingCol ? `${o.headingCol}: known at ${o.knownHeading}` : 'no heading column'];
      lines.push(`          odometry · ${parts.join(' · ')}`);
    }
  }
  lines.push('');
  if (r.warnings.length) {
    lines.push(`${r.warnings.length} warning${r.warnings.length === 1 ? '' : 's'}:`);
    for (const w of r.warnings) lines.push(`  ! ${w}`);
  } else {
    lines.push('no warnings');
  }
  return `${lines.join('\n')}\n`;
}
