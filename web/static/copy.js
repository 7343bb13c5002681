// Copy buttons and select-on-focus for the page that shows a new client
// link once. Kept in a file of its own so the pages' Content-Security-Policy
// can refuse every inline script.
document.querySelectorAll("button[data-copy]").forEach(function (b) {
	if (!navigator.clipboard) { return; }
	b.hidden = false;
	b.addEventListener("click", function () {
		var f = document.getElementById(b.dataset.copy);
		navigator.clipboard.writeText(f.value).then(function () { b.textContent = "Copied"; });
	});
});
document.querySelectorAll("input[data-select-on-focus]").forEach(function (f) {
	f.addEventListener("focus", function () { f.select(); });
});
