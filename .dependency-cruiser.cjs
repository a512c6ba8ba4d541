/**
 * The layers of src/, checked by `npm test` (`npm run lint:deps`). Dependencies point one way:
 *
 *   cli → pipeline → compare, report → fit, decode → model → kernels
 *   pipeline → fleet (fit's E-step blocks over a BullMQ queue on Redis) → fit → model → kernels
 *   io (the only file-system code) is used by pipeline; it may use model's types. report may name
 *   io's types (the tables and model file it is handed) but call none of its code.
 *   errors.ts and version.ts (src root) may be used by every layer; index.ts is the public entry.
 *
 * DEVELOPERS.md ("Architecture in a page") explains each room; this file is what holds them in place.
 */
const layer = (name, allowed) => ({
  name: `${name}-imports-only-${allowed.join('-') || 'itself'}`,
  severity: 'error',
  comment: `src/${name} may import only from ${['itself', ...allowed].join(', ')} and the src root files`,
  from: { path: `^src/${name}/` },
  to: {
    path: '^src/',
    pathNot: [`^src/(${[name, ...allowed].join('|')})/`, '^src/(errors|version)\\.ts$'],
  },
});

module.exports = {
  forbidden: [
    layer('kernels', []),
    layer('model', ['kernels']),
    layer('decode', ['model', 'kernels']),
    layer('fit', ['model', 'kernels']),
    layer('compare', ['fit', 'decode', 'model', 'kernels']),
    layer('fleet', ['fit', 'model', 'kernels']),
    layer('report', ['compare', 'fit', 'decode', 'model', 'kernels', 'io']),
    {
      name: 'report-takes-only-types-from-io',
      severity: 'error',
      comment: 'the report is pure: the pipeline reads files and tables through io and hands it the results; report may name io types',
      from: { path: '^src/report/' },
      to: { path: '^src/io/', dependencyTypesNot: ['type-only'] },
    },
    layer('io', ['model']),
    layer('pipeline', ['io', 'compare', 'report', 'fleet', 'fit', 'decode', 'model', 'kernels']),
    layer('cli', ['pipeline']),
    {
      name: 'kernels-are-pure',
      severity: 'error',
      comment: 'kernels are pure maths over typed arrays: no Node built-ins, no packages',
      from: { path: '^src/kernels/' },
      to: { dependencyTypes: ['core', 'npm', 'npm-dev', 'npm-optional', 'npm-peer', 'npm-no-pkg', 'npm-unknown'] },
    },
    {
      name: 'only-io-touches-files',
      severity: 'error',
      comment: 'file-system code lives in src/io (and the CLI entry, which maps errors and streams)',
      from: { path: '^src/', pathNot: '^src/(io|cli)/' },
      to: { path: '^(node:)?fs(/promises)?$', dependencyTypes: ['core'] },
    },
    {
      name: 'no-cycles',
      severity: 'error',
      comment: 'no file may reach itself through its imports',
      from: { path: '^src/' },
      to: { circular: true },
    },
    {
      name: 'src-never-imports-tests-or-bench',
      severity: 'error',
      from: { path: '^src/' },
      to: { path: '^(test|bench)/' },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    tsConfig: { fileName: 'tsconfig.json' },
    tsPreCompilationDeps: true,
    enhancedResolveOptions: { extensions: ['.ts', '.js'] },
  },
};
