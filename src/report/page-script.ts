/**
 * The report page's only script (inline, no network): draws the row-fit canvases when they scroll
 * into view, and the flagged-only filter. Kept as plain ES2017 for any browser.
 */
export const PAGE_SCRIPT = String.raw`
(function () {
  var dataEl = document.getElementById('row-fit-data');
  if (!dataEl) return;
  var packed = JSON.parse(dataEl.textContent);
  var raw = atob(packed.blob), bytes = new Uint8Array(raw.length);
  for (var b = 0; b < raw.length; b++) bytes[b] = raw.charCodeAt(b);
  var view = new DataView(bytes.buffer);
  // Unpack one group (see src/report/fit-data.ts): int16 little-endian, -32768 for no value.
  function unpack(g) {
    function arr(k, scale, offset, slope) {
      var out = new Array(g.n);
      for (var i = 0; i < g.n; i++) {
        var q = view.getInt16(2 * (g.o + k * g.n + i), true);
        out[i] = q === -32768 ? null : offset + i * slope + q * scale;
      }
      return out;
    }
    var x = new Array(g.n).fill(0);
    g.x.forEach(function (i) { x[i] = 1; });
    return { g: g.g, w: arr(0, g.ws, g.w0, g.wd), d: arr(1, g.vs, 0, 0), e: arr(2, g.vs, 0, 0), m: arr(3, g.vs, 0, 0), x: x };
  }
  var BLUE = '#56B4E9', ORANGE = '#E69F00', GREY = '#999999';
  function draw(canvas, f) {
    var ctx = canvas.getContext('2d');
    var W = canvas.width, H = canvas.height, top = 8, split = Math.round(H * 0.68), left = 6;
    var n = f.w.length, i, lo = Infinity, hi = -Infinity, rlo = Infinity, rhi = -Infinity;
    for (i = 0; i < n; i++) {
      if (f.d[i] === null || f.m[i] === null) continue;
      var e = f.e[i] || 0;
      lo = Math.min(lo, f.d[i] - e, f.m[i]); hi = Math.max(hi, f.d[i] + e, f.m[i]);
      var r = f.d[i] - f.m[i]; rlo = Math.min(rlo, r - e); rhi = Math.max(rhi, r + e);
    }
    if (!(hi > lo)) { hi = lo + 1; }
    var rr = Math.max(Math.abs(rlo), Math.abs(rhi), 1e-9);
    var w0 = f.w[0], w1 = f.w[n - 1];
    function X(w) { return left + (w - w0) / (w1 - w0 || 1) * (W - 2 * left); }
    function Y(v) { return top + (1 - (v - lo) / (hi - lo)) * (split - top - 4); }
    function R(v) { return split + 4 + (1 - (v + rr) / (2 * rr)) * (H - split - 8); }
    ctx.clearRect(0, 0, W, H);
    ctx.fillStyle = '#222'; ctx.font = '10px sans-serif'; ctx.fillText(f.g, left, 9);
    ctx.strokeStyle = '#ddd'; ctx.beginPath(); ctx.moveTo(left, R(0)); ctx.lineTo(W - left, R(0)); ctx.stroke();
    for (i = 0; i < n; i++) {
      if (f.d[i] === null) continue;
      var col = f.x[i] ? GREY : BLUE, x = X(f.w[i]), e2 = f.e[i] || 0;
      ctx.strokeStyle = col; ctx.fillStyle = col;
      ctx.beginPath(); ctx.moveTo(x, Y(f.d[i] - e2)); ctx.lineTo(x, Y(f.d[i] + e2)); ctx.stroke();
      ctx.fillRect(x - 1.5, Y(f.d[i]) - 1.5, 3, 3);
      if (f.m[i] !== null) {
        var res = f.d[i] - f.m[i];
        ctx.beginPath(); ctx.moveTo(x, R(res - e2)); ctx.lineTo(x, R(res + e2)); ctx.stroke();
        ctx.fillRect(x - 1, R(res) - 1, 2, 2);
      }
    }
    ctx.strokeStyle = ORANGE; ctx.lineWidth = 1.5; ctx.beginPath();
    var started = false;
    for (i = 0; i < n; i++) {
      if (f.m[i] === null) continue;
      if (!started) { ctx.moveTo(X(f.w[i]), Y(f.m[i])); started = true; } else ctx.lineTo(X(f.w[i]), Y(f.m[i]));
    }
    ctx.stroke(); ctx.lineWidth = 1;
  }
  function drawPanel(panel) {
    if (panel.getAttribute('data-drawn')) return;
    panel.setAttribute('data-drawn', '1');
    var groups = packed.panels[Number(panel.getAttribute('data-index'))];
    var canvases = panel.getElementsByTagName('canvas');
    for (var k = 0; k < canvases.length; k++) draw(canvases[k], unpack(groups[k]));
  }
  var panels = document.querySelectorAll('.row-panel');
  if ('IntersectionObserver' in window) {
    var io = new IntersectionObserver(function (entries) {
      entries.forEach(function (en) { if (en.isIntersecting) { drawPanel(en.target); io.unobserve(en.target); } });
    }, { rootMargin: '400px' });
    panels.forEach(function (p) { io.observe(p); });
  } else {
    panels.forEach(drawPanel);
  }
  var box = document.getElementById('only-flagged');
  var grid = document.getElementById('row-grid');
  var count = document.getElementById('row-count');
  var total = panels.length, flagged = document.querySelectorAll('.row-panel[data-flagged="1"]').length;
  box.addEventListener('change', function () {
    grid.classList.toggle('only-flagged', box.checked);
    count.textContent = box.checked ? flagged + ' flagged bins shown of ' + total : total + ' bins, ' + flagged + ' flagged';
  });
})();
`;
