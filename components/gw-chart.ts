import { LitElement, html, css } from 'lit';
import { customElement, property, query } from 'lit/decorators.js';
import type { ChartData } from '../src/index.js';
import { ChartController } from './chart-controller.js';

/**
 * One plot. The data come ready-made from the core (src/present/charts.ts); this element only draws them.
 * @cssproperty --gw-chart-height - plot height (default 260px).
 */
@customElement('gw-chart')
export class GwChart extends LitElement {
  static override styles = css`
    :host { display: block; position: relative; height: var(--gw-chart-height, 260px); }
    canvas { width: 100%; height: 100%; }
  `;

  @query('canvas') canvas!: HTMLCanvasElement | null;

  /** What to plot. */
  @property({ attribute: false }) data: ChartData | null = null;

  constructor() {
    super();
    new ChartController(this);
  }

  override render() {
    return html`<canvas role="img" aria-label=${this.data?.title ?? 'chart'}></canvas>`;
  }
}

declare global {
  interface HTMLElementTagNameMap { 'gw-chart': GwChart; }
}
