import { LitElement, css, svg, html, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { Prim, Schematic } from '../src/index.js';
import { drawingBounds } from '../src/index.js';

/**
 * Draws the stage's schematic primitives as SVG; text goes in as text nodes, never as markup.
 * @cssproperty --gw-schematic-max-height - tallest the drawing may be (default 360px; the printed sheet lifts it).
 */
@customElement('gw-schematic')
export class GwSchematic extends LitElement {
  static override styles = css`
    :host { display: block; }
    svg { width: 100%; height: auto; max-height: var(--gw-schematic-max-height, 360px); font: 11px system-ui, sans-serif; }
    .w { fill: none; stroke: #1d2430; stroke-width: 1.6; }
    .b { fill: #fff; stroke: #1d2430; stroke-width: 1.6; }
    .ref { font-weight: 700; fill: #1d2430; }
    .val { fill: #a4520f; }
    .lbl { fill: #566072; }
  `;

  /** The drawing, from src/present/schematic.ts. */
  @property({ attribute: false }) drawing: Schematic | null = null;

  private _prim(p: Prim) {
    switch (p.t) {
      case 'wire': return svg`<polyline class="w" points=${p.pts.map(([x, y]) => `${x},${y}`).join(' ')} />`;
      case 'dot': return svg`<circle cx=${p.x} cy=${p.y} r="3" fill="#1d2430" />`;
      case 'hop': return svg`<path class="w" d=${`M ${p.x} ${p.y - 6} A 6 6 0 0 0 ${p.x} ${p.y + 6}`} />`;
      case 'res': {
        const [w, h] = p.vertical ? [14, 50] : [50, 14];
        const arrow = p.trimmer ? svg`<line class="w" x1=${p.x - 18} y1=${p.y + 13} x2=${p.x + 18} y2=${p.y - 13} /><polygon points=${`${p.x + 18},${p.y - 13} ${p.x + 9},${p.y - 11} ${p.x + 14},${p.y - 4}`} fill="#1d2430" />` : nothing;
        const lead = p.vertical
          ? svg`<line class="w" x1=${p.x} y1=${p.y - 35} x2=${p.x} y2=${p.y - 25} /><line class="w" x1=${p.x} y1=${p.y + 25} x2=${p.x} y2=${p.y + 35} />`
          : svg`<line class="w" x1=${p.x - 50} y1=${p.y} x2=${p.x - 25} y2=${p.y} /><line class="w" x1=${p.x + 25} y1=${p.y} x2=${p.x + 50} y2=${p.y} />`;
        const tx = p.vertical ? p.x + (p.trimmer ? 24 : 14) : p.x - 25;
        const ty = p.vertical ? p.y - 3 : p.y - 12;
        return svg`${lead}<rect class="b" x=${p.x - w / 2} y=${p.y - h / 2} width=${w} height=${h} />${arrow}
          <text class="ref" x=${tx} y=${ty}>${p.ref}</text><text class="val" x=${tx} y=${ty + (p.vertical ? 13 : 34)}>${p.value}</text>`;
      }
      case 'cap': return svg`<line class="w" x1=${p.x - 12} y1=${p.y - 4} x2=${p.x + 12} y2=${p.y - 4} /><line class="w" x1=${p.x - 12} y1=${p.y + 4} x2=${p.x + 12} y2=${p.y + 4} />
        <line class="w" x1=${p.x} y1=${p.y - 15} x2=${p.x} y2=${p.y - 4} /><line class="w" x1=${p.x} y1=${p.y + 4} x2=${p.x} y2=${p.y + 15} />
        <text class="ref" x=${p.x + 16} y=${p.y - 2}>${p.ref}</text><text class="val" x=${p.x + 16} y=${p.y + 11}>${p.value}</text>`;
      case 'opamp': return svg`<polygon class="b" points=${`${p.x - 40},${p.y - 40} ${p.x - 40},${p.y + 40} ${p.x + 40},${p.y}`} />
        <text x=${p.x - 35} y=${p.y - 16} font-size="16">−</text><text x=${p.x - 35} y=${p.y + 25} font-size="16">+</text>`;
      case 'ground': return svg`<line class="w" x1=${p.x - 10} y1=${p.y} x2=${p.x + 10} y2=${p.y} /><line class="w" x1=${p.x - 6} y1=${p.y + 4} x2=${p.x + 6} y2=${p.y + 4} /><line class="w" x1=${p.x - 2} y1=${p.y + 8} x2=${p.x + 2} y2=${p.y + 8} />`;
      case 'rail': return svg`<line class="w" x1=${p.x - 10} y1=${p.y} x2=${p.x + 10} y2=${p.y} /><text class="lbl" x=${p.x + 12} y=${p.y + 4}>${p.label}</text>`;
      case 'source': return svg`<circle class="b" cx=${p.x} cy=${p.y} r="16" /><text x=${p.x - 5} y=${p.y + 4}>~</text><line class="w" x1=${p.x + 16} y1=${p.y} x2=${p.x + 30} y2=${p.y} /><text class="lbl" x=${p.x - 24} y=${p.y + 32}>${p.label}</text>`;
      case 'terminal': return svg`<circle class="b" cx=${p.x} cy=${p.y} r="5" /><text class="lbl" x=${p.x - 40} y=${p.y + 22}>${p.label}</text>`;
      case 'text': return svg`<text class="lbl" x=${p.x} y=${p.y}>${p.text}</text>`;
    }
  }

  override render() {
    const d = this.drawing;
    if (!d) return html`<p>No schematic: the design has no stage.</p>`;
    const b = drawingBounds(d);
    return html`<svg viewBox="${b.x} ${b.y} ${b.width} ${b.height}" role="img" aria-label="Schematic of the designed stage">${d.prims.map((p) => this._prim(p))}</svg>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-schematic': GwSchematic; }
}
