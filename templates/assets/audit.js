// The audit trail's way up and its addresses, from the links already on the page (the page
// itself only links down, which keeps it small: src/report/audit-view.ts).
// - “Used by”: for every step and input row, the steps whose terms link to it.
// - Any figure id as an address: #<step>/<indicator> of a step whose values carry no anchor of
//   their own scrolls to that value in its group's values table, and #<step id> to the step.
(function () {
  'use strict';
  var fragment = function (id) { return encodeURIComponent(id).replace(/%2F/g, '/').replace(/%3A/g, ':'); };
  var steps = document.querySelectorAll('.step');
  var byId = new Map();
  var users = new Map();
  steps.forEach(function (step) {
    byId.set(step.querySelector('h3 code').textContent, step);
    step.querySelectorAll('ul.terms a').forEach(function (a) {
      var target = decodeURIComponent(a.getAttribute('href').slice(1));
      var list = users.get(target);
      if (!list) users.set(target, (list = []));
      if (list[list.length - 1] !== step) list.push(step);
    });
  });
  users.forEach(function (list, target) {
    var element = document.getElementById(target);
    if (!element) return;
    var p = document.createElement('p');
    p.className = 'used-by';
    p.append(element.classList.contains('input-row') ? 'Read by ' + list.length + ' step' + (list.length === 1 ? '' : 's') + ': ' : 'Used by: ');
    list.forEach(function (source, i) {
      if (i > 0) p.append(', ');
      var a = document.createElement('a');
      a.href = '#' + fragment(source.id);
      a.textContent = source.querySelector('h3 code').textContent;
      p.append(a);
    });
    element.append(p);
  });
  var marked;
  function go() {
    var id = decodeURIComponent(location.hash.slice(1));
    if (marked) marked.classList.remove('addressed');
    marked = undefined;
    if (!id || document.getElementById(id)) return;
    var target = byId.get(id);
    if (!target) {
      var cut = id.lastIndexOf('/');
      var step = byId.get(id.slice(0, cut));
      var link = step && step.querySelector('a.to-values');
      var row = link && document.getElementById(decodeURIComponent(link.getAttribute('href').slice(1)));
      if (!row) return;
      var heads = row.closest('table').querySelectorAll('thead th');
      for (var i = 1; i < heads.length; i++) if (heads[i].textContent === id.slice(cut + 1)) target = row.cells[i];
      // Say which indicator's column it is: the header row may be far above.
      if (target) target.setAttribute('data-code', id.slice(cut + 1));
    }
    if (!target) return;
    target.classList.add('addressed');
    target.scrollIntoView({ block: 'center' });
    marked = target;
  }
  window.addEventListener('hashchange', go);
  go();
})();
