import { LitElement, svg, html, css, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { formatEng, traceDrawing, type ChartData } from '../src/index.js';

const W = 600, H = 110;
const STROKE: Record<string, string> = { main: '#000', secondary: '#555', limit: '#888', clipped: '#000', range: '#888', source: '#333' };
const DASH: Record<string, string> = { secondary: '5 3', limit: '2 3', range: '6 3' };

/**
 * A chart drawn as plain SVG lines, for the printed sheet (a canvas chart does not print reliably). The
 * data come ready-made from the core; this element only draws them.
 */
@customElement('gw-trace')
export class GwTrace extends LitElement {
  static override styles = css`:host { display: block; } svg { width: 100%; height: auto; } text { font: 9px sans-serif; }`;

  /** What to draw. */
  @property({ attribute: false }) data: ChartData | null = null;

  override render() {
    const d = this.data;
    const t = d ? traceDrawing(d, W, H) : null;
    if (!d || !t) return nothing;
    return html`<svg viewBox="-46 -4 ${W + 52} ${H + 30}" role="img" aria-label=${d.title}>
      ${svg`<rect x="0" y="0" width=${W} height=${H} fill="none" stroke="#000" stroke-width="0.6"></rect>
      ${t.lines.map((l) => svg`<polyline fill="none" stroke=${STROKE[l.role] ?? '#000'} stroke-width=${l.role === 'main' ? 1.4 : 0.8} stroke-dasharray=${DASH[l.role] ?? 'none'} points=${l.points}></polyline>`)}
      <text x="-4" y="8" text-anchor="end">${formatEng(t.y[1], 'V', 3)}</text>
      <text x="-4" y=${H} text-anchor="end">${formatEng(t.y[0], 'V', 3)}</text>
      <text x="0" y=${H + 12}>${+t.x[0].toPrecision(4)}</text>
      <text x=${W} y=${H + 12} text-anchor="end">${+t.x[1].toPrecision(4)}</text>
      <text x=${W / 2} y=${H + 24} text-anchor="middle">${d.x.label}; solid: ${d.series[0]?.label ?? ''}, dashed: ${d.series[1]?.label ?? ''}</text>`}
    </svg>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-trace': GwTrace; }
}
