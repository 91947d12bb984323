import { css } from 'lit';

/** Shared look: our own palette (slate and copper), visible focus, readable in print. */
export const base = css`
  :host {
    --gw-ink: #1d2430;
    --gw-muted: #566072;
    --gw-line: #c9cfd8;
    --gw-paper: #ffffff;
    --gw-panel: #f4f6f9;
    --gw-accent: #a4520f;
    --gw-pass: #1e6b3a;
    --gw-caution: #8a5a00;
    --gw-fail: #a11d1d;
    --gw-focus: #1f5fbf;
    color: var(--gw-ink);
    font-family: system-ui, -apple-system, 'Segoe UI', sans-serif;
    font-size: var(--gw-font-size, 15px);
    line-height: 1.45;
  }
  *:focus-visible { outline: 3px solid var(--gw-focus); outline-offset: 2px; }
  h2 { font-size: 1.05rem; margin: 0 0 0.5rem; }
  h3 { font-size: 0.95rem; margin: 0.8rem 0 0.3rem; }
  table { border-collapse: collapse; width: 100%; }
  th, td { text-align: left; padding: var(--gw-cell-pad, 0.25rem 0.4rem); border-bottom: 1px solid var(--gw-line); vertical-align: top; }
  th { font-weight: 600; color: var(--gw-muted); font-size: 0.85rem; }
  button, select, input { font: inherit; }
  button {
    border: 1px solid var(--gw-ink); background: var(--gw-paper); color: var(--gw-ink);
    border-radius: 4px; padding: 0.3rem 0.7rem; cursor: pointer;
  }
  button:hover { background: var(--gw-panel); }
  .num { font-variant-numeric: tabular-nums; }
`;

/** The look both side-by-side panels share (op-amps, supplies): a folding panel, a table of rows, a verdict tag per row. */
export const choiceTable = css`
  details > summary { cursor: pointer; font-weight: 600; }
  .scroll { overflow-x: auto; }
  table { font-size: 0.85rem; margin-top: 0.5rem; }
  td.num, th.num { text-align: right; white-space: nowrap; }
  tr.current { background: #eef3fa; }
  .tag { font-weight: 700; font-size: 0.75rem; text-transform: uppercase; border-radius: 3px; padding: 0.05rem 0.3rem; color: #fff; }
  .pass .tag { background: var(--gw-pass); }
  .caution .tag { background: var(--gw-caution); }
  .fail .tag { background: var(--gw-fail); }
  .no { color: var(--gw-fail); }
`;
