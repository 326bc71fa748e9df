// One-time password links carry their code after '#', so it never reaches a server log.
// Copy it into the form and remove it from the address bar.
(function () {
  var code = window.location.hash ? window.location.hash.substring(1) : "";
  var field = document.getElementById("link");
  if (code && field && !field.value) {
    field.value = code;
    history.replaceState(null, "", window.location.pathname);
  }
})();
