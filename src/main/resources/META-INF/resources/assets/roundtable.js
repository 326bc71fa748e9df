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
