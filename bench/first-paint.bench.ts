/**
 * First full map paint of the dashboard (target: under 3 s from the local server, issue "planner's
 * dashboard" item 7): the demo build, one Vite production build, the preview server and headless
 * Chromium with software WebGL2, as in the browser tests. Each run opens a fresh browser profile (no
 * HTTP cache) and reads the time the app records when the opening view's tiles have all been drawn
 * and the GPU has finished that frame (map-view.tsx, onFirstPaint).
 */
import { startSession } from '../tests/browser/browser-session';

export async function run(): Promise<void> {
  const s = await startSession();
  const times: number[] = [];
  try {
    for (let i = 0; i < 3; i++) {
      if (i > 0) await s.restartBrowser();
      await s.page.goto(s.url);
      await s.page.waitForSelector('[data-testid=map-wrap][data-first-paint-ms]', { timeout: 120_000 });
      const ms = Number(await s.page.getAttribute('[data-testid=map-wrap]', 'data-first-paint-ms'));
      times.push(ms);
    }
  } finally {
    await s.close();
  }
  const sorted = [...times].sort((a, b) => a - b);
  console.log(
    `first full map paint, ${times.length} cold starts: ${times.map((t) => t.toFixed(0)).join(', ')} ms`,
  );
  console.log(`median ${sorted[1].toFixed(0)} ms (target < 3000 ms)`);
}
