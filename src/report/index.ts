/** The HTML report: plots, frame strips, page assembly. Re-exports only. */
export { buildReport, tossesForDetail, type BuildReportOptions } from './buildReport.ts';
export { bandPlaneData, bandPlanePlot, bandPlaneSpec, type BandPlaneData, type BandPlaneOptions, type BoundaryVertex, type PlanePoint } from './bandPlane.ts';
export { precessionHistogramData, precessionHistogramPlot, precessionHistogramSpec, type PrecessionHistogramData } from './precessionHistogram.ts';
export { tossPlotData, tossPlots, tossPlotsSpec, type TossPlotData } from './tossPlots.ts';
export { tosserRateRows, tosserRatesPlot, tosserRatesSpec, type TosserRateRow } from './tosserRates.ts';
export { cropAround, ellipseOverlaySvg, frameStrip, pickStripFrames, type CropBox, type FrameStripOptions, type StripImage } from './frameStrip.ts';
export { SafeHtml, escapeHtml, html, htmlPage, trustedHtml, type HtmlValue, type PageOptions } from './html.ts';
export { MAX_PLOT_POINTS, PLOT_CONFIG, SIDE_COLOURS, SIDE_LABELS, SIDE_SHAPES, renderPlot, thinEvenly, type VegaLiteSpec } from './plots.ts';
export { columnDescription, columnLabel } from './labels.ts';
export { measured, percent, percentRange } from './format.ts';
export { poolingSentence, quantileTable, sameSideTable, summaryCards, tosserTable } from './summarySection.ts';
export { DETAIL_COLUMNS, tossDetail, type TossDetailContent } from './tossDetail.ts';
export { REPORT_CSS } from './styles.ts';
