// Local lint rule `boundaries/import-direction`: the import direction of every folder (DEVELOPERS.md,
// "may import"). A relative import is resolved against the importing file and both ends are placed in
// an area; the importing area must list the imported one:
//   layers/physics   -> layers/physics, layers root files
//   layers/site      -> layers/physics, layers/site, layers root files
//   layers/screening -> layers/physics, layers/site, layers/screening, layers root files
//   layers root files (grid.ts, cautions.ts, validation-error.ts) -> layers root files
//   layers/index.ts  -> all of layers/ (the barrel)
//   data-pipeline    -> layers/, data-pipeline
//   web              -> layers/, web
// bin/, tests/, bench/ and the root config files may import everything. Import cycles are checked by
// tests/unit/import-graph.test.ts.
import { dirname, relative, resolve, sep } from 'node:path';

const LAYERS = ['layers/physics', 'layers/site', 'layers/screening', 'layers/root'];
const ALLOWED = {
  'layers/physics': ['layers/physics', 'layers/root'],
  'layers/site': ['layers/physics', 'layers/site', 'layers/root'],
  'layers/screening': ['layers/physics', 'layers/site', 'layers/screening', 'layers/root'],
  'layers/root': ['layers/root'],
  'layers/index': [...LAYERS, 'layers/index'],
  'data-pipeline': [...LAYERS, 'data-pipeline'],
  web: [...LAYERS, 'web'],
};

/** The area of a repository-relative path, or null for the unrestricted folders. */
export function areaOf(rel) {
  const p = rel.split(sep).join('/');
  for (const a of ['layers/physics', 'layers/site', 'layers/screening']) {
    if (p === a || p.startsWith(`${a}/`)) return a;
  }
  if (/^layers\/index(\.tsx?)?$/.test(p)) return 'layers/index';
  if (p.startsWith('layers/')) return 'layers/root';
  if (p.startsWith('data-pipeline/')) return 'data-pipeline';
  if (p.startsWith('web/')) return 'web';
  return null;
}

/** Whether a file in area `from` may import a file in area `to` (to null: outside every area). */
export function mayImport(from, to) {
  if (from === null) return true;
  return to !== null && ALLOWED[from].includes(to);
}

const rule = {
  meta: {
    type: 'problem',
    docs: { description: 'import direction between the folders of the project' },
    messages: {
      direction: '{{from}} may not import {{to}} ({{source}}); allowed: {{allowed}} (DEVELOPERS.md)',
    },
    schema: [],
  },
  create(context) {
    const root = context.cwd;
    const file = context.filename;
    const from = areaOf(relative(root, file));
    if (from === null) return {};
    const check = (node, source) => {
      if (typeof source !== 'string' || !source.startsWith('.')) return;
      const target = relative(root, resolve(dirname(file), source));
      const to = target.startsWith('..') ? 'outside the repository' : areaOf(target);
      if (mayImport(from, to === 'outside the repository' ? null : to)) return;
      context.report({
        node,
        messageId: 'direction',
        data: { from, to: to ?? target, source, allowed: ALLOWED[from].join(', ') },
      });
    };
    return {
      ImportDeclaration: (node) => check(node, node.source.value),
      ExportNamedDeclaration: (node) => node.source && check(node, node.source.value),
      ExportAllDeclaration: (node) => check(node, node.source.value),
      ImportExpression: (node) => node.source.type === 'Literal' && check(node, node.source.value),
    };
  },
};

export default { rules: { 'import-direction': rule } };
