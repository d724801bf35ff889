// meltbook's page behaviour: marker hover and click on maps, figure
// downloads, and zooming the diffraction pattern along 2θ. No libraries;
// every page works without it, only less handily.
(function () {
  'use strict';

  // ---- Markers: hover shows the sample, click opens its run. ----

  function spaced(formula) {
    // "Al63Cu25Fe12" -> "Al63 Cu25 Fe12"
    return formula.replace(/([0-9.])([A-Z])/g, '$1 $2');
  }

  function line(tip, label, value) {
    var p = document.createElement('div');
    p.textContent = label + value;
    tip.appendChild(p);
  }

  function showTip(tip, figure, use, ev) {
    var d = use.dataset;
    var group = use.parentNode;
    tip.textContent = '';
    var code = document.createElement('strong');
    code.textContent = d.c;
    tip.appendChild(code);
    if (d.x) line(tip, '', spaced(d.x));
    line(tip, 'e/a ', d.e !== undefined ? d.e : '—');
    if (d.h) line(tip, '', d.h);
    line(tip, 'outcome: ', group.getAttribute('aria-label') || group.dataset.o || '');
    tip.hidden = false;
    var box = figure.getBoundingClientRect();
    var x = ev.clientX - box.left + 14;
    var y = ev.clientY - box.top + 14;
    if (x + tip.offsetWidth > box.width) x = ev.clientX - box.left - tip.offsetWidth - 10;
    tip.style.left = x + 'px';
    tip.style.top = y + 'px';
  }

  function setupMarkers() {
    var tip = document.querySelector('.tip');
    document.querySelectorAll('.figure-frame').forEach(function (frame) {
      var marks = frame.querySelector('.marks');
      if (!marks || !tip) return;
      var figure = tip.parentNode;
      marks.addEventListener('mousemove', function (ev) {
        var use = ev.target.closest('use');
        if (use) showTip(tip, figure, use, ev); else tip.hidden = true;
      });
      marks.addEventListener('mouseleave', function () { tip.hidden = true; });
      marks.addEventListener('click', function (ev) {
        var use = ev.target.closest('use');
        if (use && use.dataset.c) window.location.href = '/runs/' + encodeURIComponent(use.dataset.c);
      });
    });
  }

  // ---- Downloads: SVG as it is, PNG drawn at twice the size. ----

  function figureSVG(name) {
    return document.querySelector('[data-figure="' + name + '"] > svg');
  }

  function save(blob, filename) {
    var a = document.createElement('a');
    a.href = URL.createObjectURL(blob);
    a.download = filename;
    document.body.appendChild(a);
    a.click();
    a.remove();
    setTimeout(function () { URL.revokeObjectURL(a.href); }, 10000);
  }

  function svgBlob(svg) {
    var text = new XMLSerializer().serializeToString(svg);
    return new Blob(['<?xml version="1.0" encoding="UTF-8"?>\n', text], { type: 'image/svg+xml' });
  }

  function savePNG(svg, filename) {
    var vb = svg.viewBox.baseVal;
    var scale = 2;
    var img = new Image();
    var url = URL.createObjectURL(svgBlob(svg));
    img.onload = function () {
      var canvas = document.createElement('canvas');
      canvas.width = vb.width * scale;
      canvas.height = vb.height * scale;
      var ctx = canvas.getContext('2d');
      ctx.fillStyle = '#fff';
      ctx.fillRect(0, 0, canvas.width, canvas.height);
      ctx.drawImage(img, 0, 0, canvas.width, canvas.height);
      URL.revokeObjectURL(url);
      canvas.toBlob(function (png) { save(png, filename); }, 'image/png');
    };
    img.src = url;
  }

  function setupDownloads() {
    document.querySelectorAll('[data-svg]').forEach(function (b) {
      b.addEventListener('click', function () {
        var svg = figureSVG(b.dataset.svg);
        if (svg) save(svgBlob(svg), 'meltbook-' + b.dataset.svg + '.svg');
      });
    });
    document.querySelectorAll('[data-png]').forEach(function (b) {
      b.addEventListener('click', function () {
        var svg = figureSVG(b.dataset.png);
        if (svg) savePNG(svg, 'meltbook-' + b.dataset.png + '.png');
      });
    });
  }

  // ---- Pattern: zoom and pan along 2θ. ----

  // Round steps by Heckbert's rule (Graphics Gems, 1990), as the server uses.
  function nice(x, round) {
    var exp = Math.floor(Math.log10(x));
    var f = x / Math.pow(10, exp);
    var nf;
    if (round) nf = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
    else nf = f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10;
    return nf * Math.pow(10, exp);
  }

  var SVGNS = 'http://www.w3.org/2000/svg';

  function setupPattern(svg) {
    var area = svg.querySelector('svg.plot-area');
    var axis = svg.querySelector('g.x-axis');
    var labels = svg.querySelectorAll('g.peak-labels > g[data-t]');
    var figure = svg.closest('figure');
    var readout = figure && figure.querySelector('.twotheta-range');
    var t0 = parseFloat(svg.dataset.t0), t1 = parseFloat(svg.dataset.t1);
    var box = svg.dataset.box.split(' ').map(parseFloat); // x y width height
    var minSpan = Math.max((t1 - t0) / 2000, 0.05);
    var view = { lo: t0, hi: t1 };
    labels.forEach(function (g) { g.dataset.y = g.transform.baseVal.getItem(0).matrix.f; });

    function pixel(t) { return box[0] + (t - view.lo) / (view.hi - view.lo) * box[2]; }

    function drawAxis() {
      while (axis.firstChild) axis.removeChild(axis.firstChild);
      var step = nice(nice(view.hi - view.lo, false) / 9, true);
      var decimals = Math.max(0, Math.ceil(-Math.log10(step) - 1e-9));
      var d = '';
      var bottom = box[1] + box[3];
      for (var t = Math.ceil(view.lo / step) * step; t <= view.hi + step * 1e-9; t += step) {
        var x = pixel(t);
        d += 'M' + x.toFixed(1) + ' ' + bottom + 'v5';
        var text = document.createElementNS(SVGNS, 'text');
        text.setAttribute('x', x.toFixed(1));
        text.setAttribute('y', bottom + 19);
        text.textContent = t.toFixed(decimals);
        axis.appendChild(text);
      }
      var ticks = document.createElementNS(SVGNS, 'path');
      ticks.setAttribute('stroke', '#3b4450');
      ticks.setAttribute('d', d);
      axis.appendChild(ticks);
    }

    function set(lo, hi) {
      var span = Math.min(Math.max(hi - lo, minSpan), t1 - t0);
      if (lo < t0) lo = t0;
      if (lo + span > t1) lo = t1 - span;
      view.lo = lo;
      view.hi = lo + span;
      area.setAttribute('viewBox', view.lo + ' 0 ' + span + ' 1000');
      labels.forEach(function (g) {
        g.setAttribute('transform', 'translate(' + pixel(parseFloat(g.dataset.t)).toFixed(1) + ' ' + g.dataset.y + ')');
      });
      drawAxis();
      if (readout) readout.textContent = '2θ ' + view.lo.toFixed(2) + '° to ' + view.hi.toFixed(2) + '°';
    }

    function zoom(factor, centre) {
      set(centre - (centre - view.lo) * factor, centre + (view.hi - centre) * factor);
    }

    // 2θ under a pointer event, from the outer SVG's own coordinates.
    function twoThetaAt(ev) {
      var r = svg.getBoundingClientRect();
      var vb = svg.viewBox.baseVal;
      var x = (ev.clientX - r.left) * vb.width / r.width;
      return view.lo + (x - box[0]) / box[2] * (view.hi - view.lo);
    }

    area.addEventListener('wheel', function (ev) {
      ev.preventDefault();
      zoom(ev.deltaY < 0 ? 0.8 : 1.25, twoThetaAt(ev));
    }, { passive: false });

    var drag = null;
    area.addEventListener('pointerdown', function (ev) {
      drag = { x: twoThetaAt(ev), lo: view.lo, hi: view.hi };
      area.setPointerCapture(ev.pointerId);
    });
    area.addEventListener('pointermove', function (ev) {
      if (!drag) return;
      var r = svg.getBoundingClientRect();
      var shift = (ev.clientX - r.left) * svg.viewBox.baseVal.width / r.width;
      var t = drag.lo + (shift - box[0]) / box[2] * (drag.hi - drag.lo);
      var dt = drag.x - t;
      set(drag.lo + dt, drag.hi + dt);
    });
    area.addEventListener('pointerup', function () { drag = null; });
    area.addEventListener('pointercancel', function () { drag = null; });

    if (figure) {
      figure.querySelectorAll('[data-zoom]').forEach(function (b) {
        b.addEventListener('click', function () {
          var mid = (view.lo + view.hi) / 2;
          if (b.dataset.zoom === 'in') zoom(0.5, mid);
          else if (b.dataset.zoom === 'out') zoom(2, mid);
          else set(t0, t1);
        });
      });
    }
    set(t0, t1);
  }

  document.addEventListener('DOMContentLoaded', function () {
    setupMarkers();
    setupDownloads();
    document.querySelectorAll('svg.pattern').forEach(setupPattern);
  });
})();
