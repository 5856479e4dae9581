// The live preview of the check forms (weekly check, pipette check): posts the form to the server (the form's
// data-preview address) and shows what it answers. Nothing is computed here; without JavaScript the form's
// "Preview" button posts it and the page comes back with the same figures, and "Record" records.
(function () {
  "use strict";
  var form = document.querySelector("form[data-preview]");
  var panel = document.getElementById("preview");
  if (!form || !panel || !window.fetch) return;
  var timer = null;
  var sent = 0;

  function showRefusal(field, message) {
    var boxes = document.querySelectorAll("p.refusal[id$='-error']");
    Array.prototype.forEach.call(boxes, function (box) {
      var name = box.id.slice(0, -"-error".length);
      var input = document.getElementById(name);
      var mine = name === field;
      box.textContent = mine ? message : "";
      box.hidden = !mine;
      if (input) {
        if (mine) input.setAttribute("aria-invalid", "true");
        else input.removeAttribute("aria-invalid");
      }
    });
  }

  function preview() {
    var ticket = ++sent;
    var body = new URLSearchParams(new FormData(form));
    fetch(form.getAttribute("data-preview"), {
      method: "POST",
      body: body,
      credentials: "same-origin",
      headers: { "Content-Type": "application/x-www-form-urlencoded" }
    })
      .then(function (r) { return r.json(); })
      .then(function (answer) {
        if (ticket !== sent) return; // a later preview is on its way
        showRefusal(answer.field, answer.message);
        // The server's fragment, rendered from a template that escapes every text it holds.
        if (answer.html) panel.innerHTML = answer.html;
      })
      .catch(function () {});
  }

  form.addEventListener("input", function () {
    clearTimeout(timer);
    timer = setTimeout(preview, 250);
  });
  form.addEventListener("change", function () {
    clearTimeout(timer);
    timer = setTimeout(preview, 50);
  });
})();
