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
  // A session end never loses a form: the values of a page's POST forms are kept in this
  // tab's sessionStorage as they are typed, under the form's address. If the session ended,
  // the server sends the technician to log in and then back to the same form, where the
  // values are put back with a message. Landing on any other page (a stored record) forgets
  // them. The anti-forgery field and passwords are never kept.
  var KEEP = "loadhold.form:";
  var here = window.location.pathname;
  try {
    if (here !== "/login") {
      for (var k = window.sessionStorage.length - 1; k >= 0; k--) {
        var key = window.sessionStorage.key(k);
        if (key && key.indexOf(KEEP) === 0 && key !== KEEP + here) {
          var kept = JSON.parse(window.sessionStorage.getItem(key) || "{}");
          // Forget a form once another page was reached after sending it.
          if (kept.sent) { window.sessionStorage.removeItem(key); }
        }
      }
    }
    document.querySelectorAll("main form[method='post' i]").forEach(function (form) {
      var action = form.getAttribute("action") || here;
      if (action === "/login" || action === "/logout" || action !== here) { return; }
      var slot = KEEP + here;
      var skip = function (el) {
        return !el.name || el.name === "csrf" || el.type === "password" || el.type === "submit" || el.type === "button";
      };
      var save = function (sent) {
        var values = {};
        Array.prototype.forEach.call(form.elements, function (el) {
          if (skip(el)) { return; }
          if (el.type === "radio" || el.type === "checkbox") {
            if (el.checked) { values[el.name + "=" + el.value] = true; }
          } else { values[el.name] = el.value; }
        });
        window.sessionStorage.setItem(slot, JSON.stringify({ values: values, sent: sent }));
      };
      var kept = JSON.parse(window.sessionStorage.getItem(slot) || "null");
      var refused = form.querySelector("[aria-invalid='true']") || document.querySelector(".form-errors");
      if (kept && !refused) {
        Array.prototype.forEach.call(form.elements, function (el) {
          if (skip(el)) { return; }
          if (el.type === "radio" || el.type === "checkbox") {
            el.checked = kept.values[el.name + "=" + el.value] === true;
          } else if (Object.prototype.hasOwnProperty.call(kept.values, el.name)) {
            el.value = kept.values[el.name];
          }
        });
        var note = document.createElement("p");
        note.className = "panel restored";
        note.setAttribute("role", "status");
        note.textContent = kept.sent
          ? "This form was not saved: your session had ended. You are logged in again and the values you entered are back; check them and send the form again."
          : "The values you entered earlier in this tab are back; check them before you send the form.";
        var heading = document.querySelector("main h1");
        if (heading) { heading.parentNode.insertBefore(note, heading.nextSibling); }
        else { form.parentNode.insertBefore(note, form); }
      }
      form.addEventListener("input", function () { save(false); });
      form.addEventListener("change", function () { save(false); });
      form.addEventListener("submit", function () { save(true); });
    });
  } catch (e) { /* no storage (private mode): the form works as before */ }
  // Confirm before a destructive-looking submit: <form data-confirm="...">.
  document.querySelectorAll("form[data-confirm]").forEach(function (form) {
    form.addEventListener("submit", function (event) {
      if (!window.confirm(form.getAttribute("data-confirm"))) { event.preventDefault(); }
    });
  });
})();
