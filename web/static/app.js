// Progressive enhancement only: every page works without this file.
(function () {
  "use strict";
  // A stopwatch for timed holds: <button data-timer-for="duration"> fills the named input.
  document.querySelectorAll("[data-timer-for]").forEach(function (button) {
    var input = document.getElementById(button.getAttribute("data-timer-for"));
    if (!input) { return; }
    var started = null, tick = null;
    button.hidden = false;
    button.addEventListener("click", function () {
      if (started === null) {
        started = Date.now();
        button.textContent = "Stop timer";
        tick = setInterval(function () {
          input.value = Math.round((Date.now() - started) / 1000) + " s";
        }, 1000);
      } else {
        clearInterval(tick);
        input.value = Math.round((Date.now() - started) / 1000) + " s";
        started = null;
        button.textContent = "Start timer";
      }
    });
  });
  // A print button: <button data-print hidden> (without this file, the browser's own print).
  document.querySelectorAll("[data-print]").forEach(function (button) {
    button.hidden = false;
    button.addEventListener("click", function () { window.print(); });
  });
  // Confirm before a destructive-looking submit: <form data-confirm="...">.
  document.querySelectorAll("form[data-confirm]").forEach(function (form) {
    form.addEventListener("submit", function (event) {
      if (!window.confirm(form.getAttribute("data-confirm"))) { event.preventDefault(); }
    });
  });
})();
