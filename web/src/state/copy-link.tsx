/**
 * "Copy link": puts the page's URL (which always holds what is on screen, url-state.ts) on the
 * clipboard; where the clipboard is refused (insecure origin, permission) the link is shown selected
 * in a text box to copy by hand. `note` says what travels only approximately (a simplified boundary).
 */
import { useState } from 'react';

export function CopyLink(props: { note: string | null }) {
  const [state, setState] = useState<{ text: string; manual: string | null } | null>(null);
  const copy = async () => {
    const href = window.location.href;
    try {
      await navigator.clipboard.writeText(href);
      setState({ text: `Link copied${props.note ? `; ${props.note}` : ''}.`, manual: null });
    } catch {
      setState({ text: 'The browser refused the clipboard: copy the link below.', manual: href });
    }
  };
  return (
    <span className="copy-link">
      <button type="button" onClick={() => void copy()} data-testid="copy-link">
        Copy link
      </button>
      {state ? (
        <span className="muted small" role="status" data-testid="copy-link-status">
          {state.text}
          {state.manual ? (
            <input readOnly value={state.manual} onFocus={(e) => e.target.select()} autoFocus />
          ) : null}
        </span>
      ) : null}
    </span>
  );
}
