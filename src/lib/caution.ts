/** Shown beside fit previews, study results and exports; the wording defers to local codes and licensed engineering practice. */
export const CAUTION =
	"Fits and optima here are decision aids computed from your data. Check them against the source data and your organisation's approved methods before they inform hardware, especially flight- or safety-critical hardware; local codes and licensed engineering practice govern.";
