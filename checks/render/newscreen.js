// pathvet, the new-screening page: "Add a claim" adds an empty claim row
// in place. Without this script the same button posts the form, and the
// server sends it back with one more row and every input kept.
(function () {
  'use strict';
  var button = document.getElementById('add-claim');
  var rows = document.getElementById('claim-rows');
  var blank = document.getElementById('claim-template');
  var said = document.getElementById('claim-added');
  if (!button || !rows || !blank) {
    return;
  }
  button.addEventListener('click', function (event) {
    var n = rows.querySelectorAll('fieldset.ns-claim').length + 1;
    if (n > Number(rows.getAttribute('data-max'))) {
      return; // the server says why no row is added
    }
    event.preventDefault();
    rows.insertAdjacentHTML('beforeend', blank.innerHTML.split('__N__').join(String(n)));
    document.getElementById('c' + n + '-id').focus();
    if (said) {
      said.textContent = 'Claim ' + n + ' added.';
    }
  });
}());
