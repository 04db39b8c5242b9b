/** The report's stylesheet (inline). */
export const STYLE = `
body { font: 14px/1.45 system-ui, sans-serif; color: #222; margin: 0 auto; max-width: 980px; padding: 16px; }
h1 { font-size: 22px; margin: 4px 0 2px; } h2 { font-size: 17px; margin: 0 0 6px; }
.sub { color: #555; margin: 0 0 12px; }
.panel { border-top: 1px solid #ccc; padding: 10px 0 14px; }
.note, .axis-note { color: #555; font-size: 12.5px; margin: 2px 0 6px; }
.missing { color: #8a5a00; }
.row { display: flex; flex-wrap: wrap; gap: 8px; }
svg.plot { font-size: 10.5px; background: #fff; } svg.plot .axis-label { font-size: 12px; }
table { border-collapse: collapse; } th, td { text-align: left; padding: 2px 10px 2px 0; vertical-align: top; }
table.keys th { font-weight: 500; color: #444; }
table.diag td, table.diag th { border-bottom: 1px solid #eee; font-size: 12.5px; }
tr.sev-error td:first-child { color: #b00020; font-weight: 600; } tr.sev-warning td:first-child { color: #8a5a00; }
.spectrum { position: relative; width: 100%; max-height: 640px; border: 1px solid #999; }
.spectrum img, .spectrum svg { position: absolute; inset: 0; width: 100%; height: 100%; image-rendering: pixelated; }
.grid { display: flex; flex-wrap: wrap; gap: 6px; }
.grid.only-flagged .row-panel[data-flagged="0"] { display: none; }
.row-panel { border: 1px solid #ddd; padding: 3px; font-size: 11px; }
.row-panel canvas { display: block; }
.row-head { max-width: 220px; } .flag { color: #a0307a; } .ok { color: #2a7a2a; }
pre { font-size: 11.5px; overflow: auto; max-height: 420px; background: #f7f7f7; padding: 6px; }
.targets td, .targets th { border-bottom: 1px solid #eee; padding: 4px 10px 4px 0; }
.status-failed { color: #b00020; font-weight: 600; } .status-ok { color: #2a7a2a; }
`;
