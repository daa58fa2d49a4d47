// Shaftline sweep page: follow a running sweep's progress over server-sent events and
// reload the page once it stops, so the results appear. Without this script the page
// still works: reload it by hand.
(function () {
  "use strict";
  var root = document.getElementById("sweep");
  if (!root || root.dataset.state !== "running" || typeof EventSource === "undefined") { return; }
  var bar = document.getElementById("sweep-progress");
  var pct = document.getElementById("sweep-percent");
  var state = document.getElementById("sweep-state");
  var source = new EventSource("/sweeps/" + root.dataset.job + "/events");
  source.addEventListener("progress", function (e) {
    var d = JSON.parse(e.data);
    if (bar) { bar.max = d.total; bar.value = d.done; bar.textContent = d.percent + " %"; }
    if (pct) { pct.textContent = d.percent + " %"; }
  });
  source.addEventListener("end", function (e) {
    var d = JSON.parse(e.data);
    source.close();
    if (state) { state.textContent = d.state; }
    window.location.reload();
  });
}());
