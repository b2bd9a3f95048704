/**
 * The band registry (layers/screening/band-ids.ts, band-registry.ts): one entry per band, display units
 * that agree with the web's unit switch, and no band id written as a string literal anywhere else in the
 * shipped source (the pipeline, the web app, the shortlist, the CLI and the rest of layers/screening name
 * bands through `BAND`).
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';
import { BAND, BAND_IDS, METRIC_BAND_IDS } from '../../layers/screening/band-ids';
import { BAND_REGISTRY, HEADLINE_BAND_IDS } from '../../layers/screening/band-registry';
import { createScreeningModel } from '../../layers/screening/cell-screening-model';
import { BASIC_MODEL_LAYERS } from '../../layers/screening/basic-screening-model';
import { displayConversion } from '../../web/src/units/display-units';

const ROOT = join(import.meta.dirname, '..', '..');
/** The shipped source that may name bands (layers/physics and layers/site cannot see the registry). */
const SCANNED = ['layers/screening', 'web/src', 'data-pipeline', 'bin'];
const REGISTRY_FILES = new Set(['layers/screening/band-ids.ts', 'layers/screening/band-registry.ts']);
/**
 * Literals that equal a band id but name something else, each with the reason. Anything not listed here
 * (and not in a type position, an input-grid `role:` or a validator's parameter name) fails the test.
 */
const ALLOWED: { file: string; text: string; why: string }[] = [
  {
    file: 'data-pipeline/build/screen-window.ts',
    text: 'textureClass',
    why: 'input-grid role (inputs-config.ts GRID_ROLES), not a band',
  },
  { file: 'layers/screening/manifest.ts', text: 'exclusion', why: "criterion kind ('exclusion' | 'soft')" },
  { file: 'layers/screening/suitability.ts', text: 'exclusion', why: 'criterion kind' },
  { file: 'web/src/panels/class-card.tsx', text: 'exclusion', why: 'criterion kind' },
  { file: 'layers/screening/scenario.ts', text: 'suitability', why: 'scenario field path' },
];

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const e of readdirSync(join(ROOT, dir), { withFileTypes: true, recursive: true })) {
    if (!e.isFile() || !/\.(ts|tsx|mts)$/.test(e.name) || e.name.endsWith('.d.ts')) continue;
    out.push(relative(ROOT, join(e.parentPath, e.name)).split('\\').join('/'));
  }
  return out;
}

/** Band-id literals of one file that are not exempt: { line, text }. */
export function strayBandLiterals(file: string, text: string, ids: ReadonlySet<string>) {
  const sf = ts.createSourceFile(file, text, ts.ScriptTarget.Latest, true, ts.ScriptKind.TSX);
  const found: { line: number; text: string }[] = [];
  const visit = (node: ts.Node) => {
    if ((ts.isStringLiteral(node) || ts.isNoSubstitutionTemplateLiteral(node)) && ids.has(node.text)) {
      const p = node.parent;
      const typePosition = ts.isLiteralTypeNode(p);
      const importPath = ts.isImportDeclaration(p) || ts.isExportDeclaration(p);
      const role = ts.isPropertyAssignment(p) && p.initializer === node && p.name.getText(sf) === 'role';
      const validatorName =
        ts.isCallExpression(p) &&
        p.arguments[0] === node &&
        /^(require|check)\w*$/.test(p.expression.getText(sf).split('.').pop() ?? '');
      const allowed = ALLOWED.some((a) => a.file === file && a.text === node.text);
      if (!typePosition && !importPath && !role && !validatorName && !allowed)
        found.push({ line: sf.getLineAndCharacterOfPosition(node.getStart(sf)).line + 1, text: node.text });
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return found;
}

describe('band registry', () => {
  it('has one entry per band id, titles in words and known kinds', () => {
    expect(Object.keys(BAND_REGISTRY).sort()).toEqual([...BAND_IDS].sort());
    expect(new Set(BAND_IDS).size).toBe(BAND_IDS.length);
    for (const id of BAND_IDS) {
      const e = BAND_REGISTRY[id];
      expect(e.title, id).toMatch(/^[A-Z]/);
      expect(e.title, id).not.toBe(id);
      expect(e.title, id).not.toMatch(/[a-z][A-Z]|_/); // no camelCase ids or unit suffixes in a title
      if (e.kind === 'class' && id !== BAND.inputFlags) expect(e.classes?.length, id).toBeGreaterThan(1);
    }
    for (const id of HEADLINE_BAND_IDS) expect(BAND_IDS).toContain(id);
  });

  it("gives each band the North American unit the web's unit switch shows", () => {
    for (const id of BAND_IDS) {
      const e = BAND_REGISTRY[id];
      expect(displayConversion(e.unit, 'NA').unit, id).toBe(e.unitNA);
    }
  });

  it('is what both screening models write', () => {
    const full = createScreeningModel({}).layers;
    expect(full.map((l) => l.id)).toEqual([...METRIC_BAND_IDS]);
    for (const l of [...full, ...BASIC_MODEL_LAYERS]) {
      const e = BAND_REGISTRY[l.id as keyof typeof BAND_REGISTRY];
      expect(l.title, l.id).toBe(e.title);
      expect(l.kind, l.id).toBe(e.kind);
      if (l.id !== BAND.costSaved && l.id !== BAND.capitalCost) expect(l.unit, l.id).toBe(e.unit);
    }
    expect(full.find((l) => l.id === BAND.costSaved)?.unit).toMatch(/^[A-Z]{3}\/yr$/);
    expect(full.find((l) => l.id === BAND.capitalCost)?.unit).toMatch(/^[A-Z]{3}$/);
  });

  it('finds a stray band-id literal when there is one (the check can fail)', () => {
    const ids = new Set<string>(BAND_IDS);
    const src = [
      "const a = bands.find((b) => b.id === 'thawDelay');",
      "type T = Pick<X, 'thawDelay'>;",
      "const g = { role: 'meanAirTemp_C' };",
      "requireRange('meanAirTemp_C', v, 0, 1, 'C');",
      'const ok = BAND.thawDelay;',
    ].join('\n');
    expect(strayBandLiterals('x.ts', src, ids)).toEqual([{ line: 1, text: 'thawDelay' }]);
  });

  it('leaves no band id as a string literal outside the registry', () => {
    const ids = new Set<string>(BAND_IDS);
    const strays: string[] = [];
    for (const dir of SCANNED)
      for (const file of sourceFiles(dir)) {
        if (REGISTRY_FILES.has(file)) continue;
        for (const s of strayBandLiterals(file, readFileSync(join(ROOT, file), 'utf8'), ids))
          strays.push(`${file}:${s.line} '${s.text}'`);
      }
    expect(strays, 'use BAND.<id> from layers/screening/band-ids.ts').toEqual([]);
  });
});
