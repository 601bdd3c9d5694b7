export { loopNames, pointLabel, pointName, shortPointNames, edgeName, loopNameAt, cableName } from './numbering'
export { formatCell, columnHeader, type Cell, type Column, type ReportTable } from './table'
export { reportTables, utcMinute, type ReportFrame, type ReportInput, type ReportPin } from './tables'
export { contourInterval, contourLevels, contourSegments } from './contours'
