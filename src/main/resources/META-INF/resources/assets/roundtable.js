// Progressive enhancement only: every page works without this file.
// A confirmation step fetched by htmx (tags/confirm.html) opens in the page's <dialog>; where the answer holds no
// confirmation (the action needed none), the page is loaded again to show what happened.
(function () {
  document.addEventListener("htmx:afterSwap", function (event) {
    var body = document.getElementById("confirm-dialog-body");
    if (!body || event.detail.target !== body) {
      return;
    }
    var dialog = document.getElementById("confirm-dialog");
    if (body.querySelector(".confirmation")) {
      dialog.showModal();
      var first = body.querySelector("textarea, button");
      if (first) {
        first.focus();
      }
    } else {
      window.location.reload();
    }
  });
  document.addEventListener("click", function (event) {
    var back = event.target.closest("#confirm-dialog #confirm-back");
    if (back) {
      event.preventDefault();
      document.getElementById("confirm-dialog").close();
    }
  });
})();
// The plan editor (scheme/plan.html): show only the inputs the chosen methods need. Without this file every input
// is shown, each with a line saying when it applies.
(function () {
  function refresh(part) {
    var checked = part.querySelector("input[type=radio][data-method]:checked");
    var method = checked ? checked.value : "";
    part.querySelectorAll(".plan-inputs[data-when]").forEach(function (inputs) {
      var shown = inputs.getAttribute("data-when").split(" ").indexOf(method) >= 0
        || inputs.querySelector(".field-invalid") !== null;
      inputs.hidden = !shown;
    });
  }
  function include(row) {
    var box = row.querySelector("input[type=checkbox][name$='.include']");
    if (box) {
      row.classList.toggle("plan-row-off", !box.checked);
    }
  }
  function start() {
    document.querySelectorAll(".plan-row").forEach(function (row) {
      include(row);
      row.addEventListener("change", function () { include(row); });
    });
    document.querySelectorAll(".plan-row [data-part]").forEach(function (part) {
      refresh(part);
      part.addEventListener("change", function () { refresh(part); });
    });
  }
  if (document.readyState === "loading") {
    document.addEventListener("DOMContentLoaded", start);
  } else {
    start();
  }
})();
