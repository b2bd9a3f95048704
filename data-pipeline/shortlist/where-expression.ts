/**
 * The shortlist's filter language, e.g.
 *   thawDelay_yr >= 10 and pilesPerTon <= 3 and not excluded
 *   suitability = good or (suitability = fair and groundTemp < -3)
 *
 * Grammar (keywords case-insensitive):
 *   expr       := term ("or" term)*
 *   term       := factor ("and" factor)*
 *   factor     := "not" factor | "(" expr ")" | comparison | band
 *   comparison := band op value          op: < <= > >= = == !=
 *   value      := number | class label (word or "quoted")
 *   band       := a band id of the manifest, or its export column name (export-schema.ts); a unit
 *                 suffix is allowed when it matches the band's unit
 *                 (thawDelay_yr for band thawDelay in yr); `excluded` means `exclusion != 0`.
 * A bare band is true when its value is non-zero. Comparisons with nodata are false. Errors name the
 * offending token and its position.
 */
import { bandColumnName } from '../../layers/screening/export-schema';
import { InputError } from '../input-error';
import { BAND } from '../../layers/screening/band-ids';

export interface ExpressionBand {
  id: string;
  unit: string;
  kind: 'continuous' | 'class';
  classes?: { value: number; label: string }[];
}

type Op = '<' | '<=' | '>' | '>=' | '=' | '!=';
type Node =
  | { kind: 'or' | 'and'; left: Node; right: Node }
  | { kind: 'not'; operand: Node }
  | { kind: 'compare'; band: number; op: Op; value: number }
  | { kind: 'truthy'; band: number };

interface Token {
  text: string;
  type: 'word' | 'number' | 'string' | 'op' | 'paren' | 'end';
  pos: number;
}

export interface CompiledWhere {
  /** Indices into the band list the expression reads. */
  bandsUsed: number[];
  /** Evaluate with the cell's values (indexed like the band list). */
  test(values: ArrayLike<number>): boolean;
}

function tokenize(source: string): Token[] {
  const tokens: Token[] = [];
  const re =
    /\s*(?:(\d+(?:\.\d*)?(?:[eE][-+]?\d+)?|\.\d+(?:[eE][-+]?\d+)?|-\d+(?:\.\d*)?(?:[eE][-+]?\d+)?)|([A-Za-z_][A-Za-z0-9_]*)|("[^"]*"|'[^']*')|(<=|>=|==|!=|<|>|=)|([()]))/y;
  let pos = 0;
  while (pos < source.length) {
    if (/^\s*$/.test(source.slice(pos))) break;
    re.lastIndex = pos;
    const m = re.exec(source);
    if (!m) {
      const at = pos + (source.slice(pos).length - source.slice(pos).trimStart().length);
      throw new InputError(`--where: unexpected character "${source[at]}" at position ${at + 1}`);
    }
    const start = m.index + (m[0].length - m[0].trimStart().length);
    if (m[1] !== undefined) tokens.push({ text: m[1], type: 'number', pos: start });
    else if (m[2] !== undefined) tokens.push({ text: m[2], type: 'word', pos: start });
    else if (m[3] !== undefined) tokens.push({ text: m[3].slice(1, -1), type: 'string', pos: start });
    else if (m[4] !== undefined) tokens.push({ text: m[4], type: 'op', pos: start });
    else tokens.push({ text: m[5], type: 'paren', pos: start });
    pos = re.lastIndex;
  }
  tokens.push({ text: '(end)', type: 'end', pos: source.length });
  return tokens;
}

const normaliseUnit = (u: string) =>
  u
    .replace(/°/g, '')
    .replace(/[³]/g, '3')
    .replace(/[²]/g, '2')
    .replace(/[^A-Za-z0-9]/g, '')
    .toLowerCase();
const normaliseLabel = (s: string) => s.toLowerCase().replace(/[_-]+/g, ' ').trim();

const fail = (t: Token, expected: string): never => {
  throw new InputError(
    `--where: ${t.type === 'end' ? 'unexpected end of expression' : `unexpected token "${t.text}" at position ${t.pos + 1}`} (expected ${expected})`,
  );
};
const isKeyword = (t: Token, k: string) => t.type === 'word' && t.text.toLowerCase() === k;

/** The band a word names: its id, or its id with a unit suffix matching the band's unit. */
function resolveBand(bands: ExpressionBand[], t: Token): number {
  const exact = bands.findIndex((b) => b.id === t.text);
  if (exact >= 0) return exact;
  // The export's column name (groundTemp_degC, pilesPerTon_piles_per_ton, suitability_class).
  const column = bands.findIndex((b) => bandColumnName(b) === t.text);
  if (column >= 0) return column;
  const cut = t.text.lastIndexOf('_');
  if (cut > 0) {
    const base = bands.findIndex((b) => b.id === t.text.slice(0, cut));
    if (base >= 0) {
      const suffix = t.text.slice(cut + 1);
      if (normaliseUnit(suffix) === normaliseUnit(bands[base].unit)) return base;
      throw new InputError(
        `--where: "${t.text}" at position ${t.pos + 1}: band ${bands[base].id} is in "${bands[base].unit || 'class codes'}", not "${suffix}"`,
      );
    }
  }
  throw new InputError(
    `--where: unknown band "${t.text}" at position ${t.pos + 1} (bands: ${bands.map((b) => b.id).join(', ')})`,
  );
}

/** Recursive-descent parser over the tokens (grammar in the module comment). */
class WhereParser {
  private i = 0;
  readonly used = new Set<number>();

  constructor(
    private readonly tokens: Token[],
    private readonly bands: ExpressionBand[],
  ) {}

  peek(): Token {
    return this.tokens[this.i];
  }

  parseOr(): Node {
    let node = this.parseAnd();
    while (isKeyword(this.peek(), 'or')) {
      this.i++;
      node = { kind: 'or', left: node, right: this.parseAnd() };
    }
    return node;
  }

  private parseAnd(): Node {
    let node = this.parseFactor();
    while (isKeyword(this.peek(), 'and')) {
      this.i++;
      node = { kind: 'and', left: node, right: this.parseFactor() };
    }
    return node;
  }

  private parseFactor(): Node {
    const t = this.peek();
    if (isKeyword(t, 'not')) {
      this.i++;
      return { kind: 'not', operand: this.parseFactor() };
    }
    if (t.type === 'paren' && t.text === '(') {
      this.i++;
      const inner = this.parseOr();
      const close = this.tokens[this.i++];
      if (!(close.type === 'paren' && close.text === ')')) fail(close, '")"');
      return inner;
    }
    if (t.type !== 'word' || isKeyword(t, 'and') || isKeyword(t, 'or'))
      return fail(t, 'a band name, "not" or "("');
    this.i++;
    const bands = this.bands;
    if (t.text === 'excluded' && !bands.some((b) => b.id === 'excluded')) {
      const band = bands.findIndex((b) => b.id === BAND.exclusion);
      if (band < 0)
        throw new InputError(`--where: "excluded" at position ${t.pos + 1} needs an exclusion band`);
      this.used.add(band);
      return { kind: 'truthy', band };
    }
    const band = resolveBand(bands, t);
    this.used.add(band);
    const opToken = this.peek();
    if (opToken.type !== 'op') return { kind: 'truthy', band };
    this.i++;
    const op = (opToken.text === '==' ? '=' : opToken.text) as Op;
    return { kind: 'compare', band, op, value: this.parseValue(bands[band]) };
  }

  private parseValue(band: ExpressionBand): number {
    const t = this.tokens[this.i++];
    if (t.type === 'number') return Number(t.text);
    if (t.type === 'word' || t.type === 'string') {
      const match = band.classes?.find((c) => normaliseLabel(c.label) === normaliseLabel(t.text));
      if (match) return match.value;
      const labels = band.classes?.map((c) => `"${c.label}"`).join(', ');
      throw new InputError(
        `--where: "${t.text}" at position ${t.pos + 1} is not a ${band.kind === 'class' ? `class of ${band.id} (classes: ${labels})` : `number (${band.id} is continuous, in ${band.unit})`}`,
      );
    }
    return fail(t, `a number or class label after the operator`);
  }
}

function compare(v: number, op: Op, value: number): boolean {
  switch (op) {
    case '<':
      return v < value;
    case '<=':
      return v <= value;
    case '>':
      return v > value;
    case '>=':
      return v >= value;
    case '=':
      return v === value;
    case '!=':
      return v !== value;
  }
}

function evaluate(node: Node, values: ArrayLike<number>): boolean {
  switch (node.kind) {
    case 'or':
      return evaluate(node.left, values) || evaluate(node.right, values);
    case 'and':
      return evaluate(node.left, values) && evaluate(node.right, values);
    case 'not':
      return !evaluate(node.operand, values);
    case 'truthy': {
      const v = values[node.band];
      return v === v && v !== 0;
    }
    case 'compare': {
      const v = values[node.band];
      if (v !== v) return false;
      return compare(v, node.op, node.value);
    }
  }
}

/** Parse and compile `source` against the bands of a build. Throws InputError naming the token. */
export function compileWhere(source: string, bands: ExpressionBand[]): CompiledWhere {
  const tokens = tokenize(source);
  if (tokens.length === 1) throw new InputError('--where: empty expression');
  const parser = new WhereParser(tokens, bands);
  const root = parser.parseOr();
  if (parser.peek().type !== 'end') fail(parser.peek(), '"and", "or" or the end of the expression');
  return { bandsUsed: [...parser.used].sort((a, b) => a - b), test: (values) => evaluate(root, values) };
}
