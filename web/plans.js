// Progressive enhancement of the new-plan form: show only the sections the
// chosen kind of plan uses. Without this script every section shows, and
// the server ignores the fields a kind does not need.
(function () {
  var form = document.getElementById("plan-start");
  if (!form) return;
  function update() {
    var chosen = form.querySelector('input[name="kind"]:checked');
    var kind = chosen ? chosen.value : "";
    form.querySelectorAll(".kind-section").forEach(function (el) {
      var kinds = (el.getAttribute("data-kinds") || "").split(" ");
      el.hidden = kind !== "" && kinds.indexOf(kind) < 0;
    });
  }
  form.querySelectorAll('input[name="kind"]').forEach(function (r) { r.addEventListener("change", update); });
  update();
})();
