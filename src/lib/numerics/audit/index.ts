export { auditSmoothness, compareContinuity, type KnotJump, type MeasuredContinuity, type SmoothnessAudit, type SmoothnessOptions } from './smoothness';
export { auditFidelity, type FidelityAudit, type FidelityOptions } from './fidelity';
export { auditSurfaceSmoothness, auditSurfaceFidelity, type LineJump, type SurfaceSmoothnessAudit, type SurfaceFidelityAudit } from './surfaceAudit';
