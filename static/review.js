// Shaftline review pages: follow the presenter over server-sent events, and show new
// comments and decisions as they arrive. Without this script the pages still work;
// they just do not move by themselves.
(function () {
  "use strict";
  var root = document.getElementById("review");
  if (!root || typeof EventSource === "undefined") { return; }
  var id = root.dataset.review;
  var here = root.dataset.view;
  var presenting = root.dataset.presenting === "1";
  var open = root.dataset.open === "1";
  var key = "shaftline-follow-" + id;
  var presenterUrl = null;
  var presenterView = root.dataset.current;

  var state = document.getElementById("follow-state");
  var stop = document.getElementById("stop-following");
  var again = document.getElementById("follow-again");

  function following() { return sessionStorage.getItem(key) !== "off"; }

  function showState() {
    if (presenting || !state) { return; }
    if (following()) {
      state.textContent = "Following the presenter.";
    } else {
      state.textContent = "Not following: you can look around; the presenter is on another screen.";
    }
    if (stop) { stop.hidden = !following(); }
    if (again) { again.hidden = following(); }
  }

  function go() {
    if (!presenting && following() && presenterUrl && presenterView !== here) {
      window.location.assign(presenterUrl);
    }
  }

  if (stop) {
    stop.addEventListener("click", function () { sessionStorage.setItem(key, "off"); showState(); });
  }
  if (again) {
    again.addEventListener("click", function () { sessionStorage.removeItem(key); showState(); go(); });
  }

  function append(listId, parts) {
    var list = document.getElementById(listId);
    if (!list) { return; }
    var li = document.createElement("li");
    parts.forEach(function (p) {
      var el = document.createElement(p.tag || "span");
      if (p.cls) { el.className = p.cls; }
      el.textContent = p.text;
      li.appendChild(el);
    });
    list.appendChild(li);
  }

  if (!open) { return; }
  var source = new EventSource("/reviews/" + id + "/events");
  source.addEventListener("view", function (e) {
    var d = JSON.parse(e.data);
    presenterView = d.view;
    presenterUrl = d.url;
    go();
  });
  source.addEventListener("comment", function (e) {
    var d = JSON.parse(e.data);
    var on = d.candidate ? d.candidate : "the review";
    append("comments", [
      { cls: "muted", text: d.who + " · " + d.when + " · on " + on + ": " },
      { text: d.body }
    ]);
  });
  source.addEventListener("decision", function (e) {
    var d = JSON.parse(e.data);
    var label = d.outcome === "carry_forward" ? "carry forward" : d.outcome;
    append("decisions", [
      { tag: "strong", text: d.candidate },
      { text: ": " + label + " — " + d.rationale + " " },
      { cls: "muted", text: "(" + d.who + ", " + d.when + ")" }
    ]);
  });
  // A handover or a close changes which controls each person has: reload the page.
  source.addEventListener("presenter", function () { window.location.reload(); });
  source.addEventListener("closed", function () { window.location.reload(); });
  showState();
}());
