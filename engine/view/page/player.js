// A small player of the glTF binary files clatter writes (meshes of
// triangles with flat normals, a base colour per material, linear
// translation and rotation keyframes). It draws on a 2-D canvas with the
// painter's algorithm, so it needs no WebGL and no GPU.
(function () {
  "use strict";
  var el = document.getElementById("glb");
  var canvas = document.getElementById("motion");
  if (!el || !canvas) return;
  var raw = atob(el.textContent.trim());
  var bytes = new Uint8Array(raw.length);
  for (var i = 0; i < raw.length; i++) bytes[i] = raw.charCodeAt(i);
  var dv = new DataView(bytes.buffer);
  var jsonLen = dv.getUint32(12, true);
  var doc = JSON.parse(new TextDecoder().decode(bytes.subarray(20, 20 + jsonLen)));
  var binStart = 20 + jsonLen + 8;
  function accessor(k) {
    var a = doc.accessors[k], v = doc.bufferViews[a.bufferView];
    var n = {SCALAR: 1, VEC3: 3, VEC4: 4}[a.type];
    return new Float32Array(bytes.buffer, binStart + (v.byteOffset || 0) + (a.byteOffset || 0), a.count * n);
  }
  function srgb(c) { return Math.round(255 * (c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(c, 1 / 2.4) - 0.055)); }
  function qrot(q, v) { // q = [x, y, z, w]
    var x = q[0], y = q[1], z = q[2], w = q[3];
    var tx = 2 * (y * v[2] - z * v[1]), ty = 2 * (z * v[0] - x * v[2]), tz = 2 * (x * v[1] - y * v[0]);
    return [v[0] + w * tx + (y * tz - z * ty), v[1] + w * ty + (z * tx - x * tz), v[2] + w * tz + (x * ty - y * tx)];
  }
  var root = doc.nodes[0];
  var bodies = [];
  (root.children || []).forEach(function (ni) {
    var n = doc.nodes[ni], b = {t: n.translation || [0, 0, 0], r: n.rotation || [0, 0, 0, 1], prims: [],
      patch: !!(n.extras && n.extras.patch)};
    if (n.mesh !== undefined) doc.meshes[n.mesh].primitives.forEach(function (p) {
      var f = doc.materials[p.material].pbrMetallicRoughness.baseColorFactor;
      b.prims.push({pos: accessor(p.attributes.POSITION), col: [srgb(f[0]), srgb(f[1]), srgb(f[2])]});
    });
    b.node = ni;
    bodies.push(b);
  });
  var times = [0], tracks = {};
  (doc.animations || []).forEach(function (a) {
    a.channels.forEach(function (c) {
      var s = a.samplers[c.sampler];
      times = accessor(s.input);
      (tracks[c.target.node] = tracks[c.target.node] || {})[c.target.path] = accessor(s.output);
    });
  });
  var end = times[times.length - 1];
  function pose(b, t) {
    var tr = tracks[b.node];
    if (!tr) return [b.t, b.r];
    var lo = 0, hi = times.length - 1;
    while (hi - lo > 1) { var m = (lo + hi) >> 1; if (times[m] <= t) lo = m; else hi = m; }
    var u = hi > lo ? Math.min(1, Math.max(0, (t - times[lo]) / (times[hi] - times[lo]))) : 0;
    var T = tr.translation, R = tr.rotation, p = [], q = [];
    for (var k = 0; k < 3; k++) p.push(T[3 * lo + k] * (1 - u) + T[3 * hi + k] * u);
    for (k = 0; k < 4; k++) q.push(R[4 * lo + k] * (1 - u) + R[4 * hi + k] * u);
    var l = Math.hypot(q[0], q[1], q[2], q[3]);
    return [p, q.map(function (x) { return x / l; })];
  }
  function world(b, ps, v) {
    var p = qrot(ps[1], v);
    return qrot(root.rotation || [0, 0, 0, 1], [p[0] + ps[0][0], p[1] + ps[0][1], p[2] + ps[0][2]]);
  }
  // The camera frames every body at the start and end (glTF is y up).
  var lo = [1e30, 1e30, 1e30], hi = [-1e30, -1e30, -1e30];
  [0, end].forEach(function (t) {
    bodies.forEach(function (b) {
      if (b.patch) return; // a floor patch does not set the frame
      var ps = pose(b, t);
      b.prims.forEach(function (pr) {
        for (var i = 0; i < pr.pos.length; i += 3) {
          var w = world(b, ps, [pr.pos[i], pr.pos[i + 1], pr.pos[i + 2]]);
          for (var k = 0; k < 3; k++) { lo[k] = Math.min(lo[k], w[k]); hi[k] = Math.max(hi[k], w[k]); }
        }
      });
    });
  });
  if (lo[0] > hi[0]) { lo = [-1, -1, -1]; hi = [1, 1, 1]; }
  var c = [(lo[0] + hi[0]) / 2, (lo[1] + hi[1]) / 2, (lo[2] + hi[2]) / 2];
  var rad = Math.max(1e-3, Math.hypot(hi[0] - lo[0], hi[1] - lo[1], hi[2] - lo[2]) / 2);
  var az = 35 * Math.PI / 180, el2 = 30 * Math.PI / 180, fov = 30 * Math.PI / 180;
  var toEye = [-Math.sin(az) * Math.cos(el2), Math.sin(el2), Math.cos(az) * Math.cos(el2)];
  var dist = 1.15 * rad / Math.sin(fov / 2);
  var eye = [c[0] + toEye[0] * dist, c[1] + toEye[1] * dist, c[2] + toEye[2] * dist];
  var fwd = toEye.map(function (x) { return -x; });
  var right = [fwd[1] * 0 - fwd[2] * 1, fwd[2] * 0 - fwd[0] * 0, fwd[0] * 1 - fwd[1] * 0];
  var rl = Math.hypot(right[0], right[1], right[2]); right = right.map(function (x) { return x / rl; });
  var up = [right[1] * fwd[2] - right[2] * fwd[1], right[2] * fwd[0] - right[0] * fwd[2], right[0] * fwd[1] - right[1] * fwd[0]];
  var light = [0.8 * up[0] - 0.45 * fwd[0] - 0.4 * right[0], 0.8 * up[1] - 0.45 * fwd[1] - 0.4 * right[1], 0.8 * up[2] - 0.45 * fwd[2] - 0.4 * right[2]];
  var ll = Math.hypot(light[0], light[1], light[2]); light = light.map(function (x) { return x / ll; });
  var ctx = canvas.getContext("2d"), W = canvas.width, H = canvas.height;
  var focal = H / 2 / Math.tan(fov / 2);
  function dot(a, b) { return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]; }
  function draw(t) {
    var tris = [];
    bodies.forEach(function (b) {
      var ps = pose(b, t);
      b.prims.forEach(function (pr) {
        for (var i = 0; i < pr.pos.length; i += 9) {
          var v = [], z = 0, ok = true;
          for (var k = 0; k < 3; k++) {
            var w = world(b, ps, [pr.pos[i + 3 * k], pr.pos[i + 3 * k + 1], pr.pos[i + 3 * k + 2]]);
            var d = [w[0] - eye[0], w[1] - eye[1], w[2] - eye[2]], dz = dot(d, fwd);
            if (dz < 0.01 * dist) ok = false;
            v.push([W / 2 + focal * dot(d, right) / dz, H / 2 - focal * dot(d, up) / dz, w]);
            z += dz;
          }
          if (!ok) continue;
          var a = v[0][2], e1 = [v[1][2][0] - a[0], v[1][2][1] - a[1], v[1][2][2] - a[2]], e2 = [v[2][2][0] - a[0], v[2][2][1] - a[1], v[2][2][2] - a[2]];
          var n = [e1[1] * e2[2] - e1[2] * e2[1], e1[2] * e2[0] - e1[0] * e2[2], e1[0] * e2[1] - e1[1] * e2[0]];
          var nl = Math.hypot(n[0], n[1], n[2]); if (nl === 0) continue;
          // Triangles face outward: the back of a closed body is hidden
          // (a floor patch shows both sides).
          if (dot(n, [eye[0] - a[0], eye[1] - a[1], eye[2] - a[2]]) < 0) {
            if (!b.patch) continue;
            n = n.map(function (x) { return -x; });
          }
          var s = 0.5 + 0.55 * Math.max(0, dot(n, light) / nl);
          tris.push({z: z, v: v, col: "rgb(" + pr.col.map(function (x) { return Math.min(255, Math.round(x * s)); }).join(",") + ")", flat: b.patch});
        }
      });
    });
    // Floors first, then far to near.
    tris.sort(function (p, q) { return (q.flat - p.flat) || (q.z - p.z); });
    ctx.fillStyle = "#f4f4f6"; ctx.fillRect(0, 0, W, H); ctx.lineJoin = "round";
    tris.forEach(function (tr) {
      ctx.beginPath(); ctx.moveTo(tr.v[0][0], tr.v[0][1]); ctx.lineTo(tr.v[1][0], tr.v[1][1]); ctx.lineTo(tr.v[2][0], tr.v[2][1]); ctx.closePath();
      ctx.fillStyle = tr.col; ctx.strokeStyle = tr.col; ctx.lineWidth = 0.5; ctx.fill(); ctx.stroke();
    });
    ctx.fillStyle = "#222"; ctx.font = "14px sans-serif"; ctx.fillText("t = " + t.toFixed(3) + " s", 10, 20);
    canvas.dataset.drawn = String(tris.length);
    canvas.dataset.time = String(t);
  }
  var slider = document.getElementById("time"), button = document.getElementById("play");
  var playing = false, t0 = 0, start = 0;
  slider.max = end; slider.step = end / 1000 || 0.001;
  slider.oninput = function () { playing = false; button.textContent = "Play"; draw(+slider.value); };
  function frame(now) {
    if (!playing) return;
    var t = start + (now - t0) / 1000;
    if (t > end) { t = end; playing = false; button.textContent = "Play"; }
    slider.value = t; draw(t);
    if (playing) requestAnimationFrame(frame);
  }
  button.onclick = function () {
    playing = !playing; button.textContent = playing ? "Pause" : "Play";
    if (playing) { start = +slider.value >= end ? 0 : +slider.value; t0 = performance.now(); requestAnimationFrame(frame); }
  };
  // A link may open the page at a time: report.html#t=0.5 (s).
  var at = /t=([0-9.eE+-]+)/.exec(location.hash);
  var first = at ? Math.max(0, Math.min(end, +at[1])) : 0;
  slider.value = first;
  draw(first);
})();
