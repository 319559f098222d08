export { esc, levelLetter, n, STYLE, svgFrame, type SvgFrameOptions } from './svgStyle.js';
export { vectorDiagramSvg, type VectorDiagramOptions } from './vectorDiagramSvg.js';
export { sectorOverviewSvg } from './sectorOverviewSvg.js';
export { deratingCurveSvg, type DeratingCurveSvgOptions, type DeratingSeries } from './deratingCurveSvg.js';
export { legLayout, type LegLayout } from './legLayout.js';
export { legSchematicSvg, type LegSchematicOptions } from './legSchematicSvg.js';
export { switchingPeriodSvg, type SwitchingPeriodOptions } from './switchingPeriodSvg.js';
export { atlasHeatmapSvg, atlasPairMatrixSvg, ratioColour } from './faultAtlasSvg.js';
export { lossBarsSvg, spectrumSvg, waveformsSvg, type SpectrumSvgOptions } from './simulationSvg.js';
