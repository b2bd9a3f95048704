/**
 * A progress bar with ETA on stderr. On a terminal it redraws one line; otherwise (logs, tests) it
 * prints a line at most every few seconds and at each stage's end, so logs stay short.
 */
export interface Progress {
  stage: string;
  done: number;
  total: number;
}

function formatSeconds(s: number): string {
  if (!Number.isFinite(s)) return '--';
  if (s < 60) return `${s.toFixed(0)}s`;
  return `${Math.floor(s / 60)}m${String(Math.round(s % 60)).padStart(2, '0')}s`;
}

export function createProgressBar(stream: NodeJS.WriteStream = process.stderr): (p: Progress) => void {
  let stage = '';
  let stageStart = 0;
  let lastPrint = 0;
  const tty = Boolean(stream.isTTY);
  return ({ stage: s, done, total }) => {
    const now = Date.now();
    if (s !== stage) {
      if (tty && stage) stream.write('\n');
      stage = s;
      stageStart = now;
      lastPrint = 0;
    }
    const fraction = total > 0 ? Math.min(1, done / total) : 1;
    const finished = done >= total;
    if (!finished && now - lastPrint < (tty ? 100 : 5000)) return;
    lastPrint = now;
    const elapsed = (now - stageStart) / 1000;
    const eta = fraction > 0 ? (elapsed * (1 - fraction)) / fraction : Infinity;
    const width = 24;
    const filled = Math.round(fraction * width);
    const bar = '#'.repeat(filled) + '-'.repeat(width - filled);
    const line = `${stage.padEnd(10)} [${bar}] ${(fraction * 100).toFixed(0).padStart(3)}% ${done}/${total} elapsed ${formatSeconds(elapsed)} eta ${finished ? '0s' : formatSeconds(eta)}`;
    if (tty) stream.write(`\r${line}${finished ? '\n' : ''}`);
    else stream.write(`${line}\n`);
    if (finished) stage = '';
  };
}
