export { OKABE_ITO, SERIES_COLOURS, seriesColour } from './palette.js';
export { Figure, formatNumber, type NumbersTable } from './figure.js';
export { LineChart, type LineChartProps, type LineSeries } from './line-chart.js';
export { IntervalChart, type IntervalChartProps, type IntervalRow } from './interval-chart.js';
export { Histogram, type Bin } from './histogram.js';
export { ShareStrip, type StripPart } from './share-strip.js';
