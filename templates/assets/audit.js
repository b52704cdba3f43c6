// The audit trail's way up and its addresses, from the links already on the page (the page
// itself only links down, which keeps it small: src/report/audit-view.ts).
// - Steps: an entry (div.step) each, or a row of a run's table (table.run) whose head cell is
//   what the step's id puts for the `*` of the run's pattern.
// - “Used by”: for every step and input row, the steps whose terms link to it.
// - Any figure id as an address: #<step>/<indicator> of a step whose values carry no anchor of
//   their own scrolls to that value (in the step's row of its run, or of its group's values
//   table), and #<step id> to the step; the value's cell says which indicator it is.
(function () {
  'use strict';
  var fragment = function (id) { return encodeURIComponent(id).replace(/%2F/g, '/').replace(/%3A/g, ':'); };
  var steps = [];
  document.querySelectorAll('.step').forEach(function (step) {
    steps.push({ element: step, id: step.querySelector('h3 code').textContent, links: step.querySelectorAll('ul.terms a, table.terms td a') });
  });
  document.querySelectorAll('div.run').forEach(function (run) {
    var pattern = run.querySelector('h3 code').textContent;
    var shared = Array.prototype.slice.call(run.querySelectorAll('p.shared a'));
    run.querySelectorAll('tbody tr').forEach(function (row) {
      steps.push({ element: row, id: pattern.replace('*', row.cells[0].textContent), links: shared.concat(Array.prototype.slice.call(row.querySelectorAll('td a'))) });
    });
  });
  var byId = new Map();
  var users = new Map();
  steps.forEach(function (step) {
    byId.set(step.id, step.element);
    Array.prototype.forEach.call(step.links, function (a) {
      var target = decodeURIComponent(a.getAttribute('href').slice(1));
      var list = users.get(target);
      if (!list) users.set(target, (list = []));
      if (list[list.length - 1] !== step) list.push(step);
    });
  });
  users.forEach(function (list, target) {
    var element = document.getElementById(target);
    if (!element) return;
    // An input row's own links land on its text (pre); its list goes below it. A run's row gets it in its head cell.
    if (element.tagName === 'PRE' || element.tagName === 'TD') element = element.parentElement;
    var input = element.classList.contains('input-row');
    var p = document.createElement(element.tagName === 'TR' ? 'span' : 'p');
    p.className = 'used-by';
    p.append(input ? 'Read by ' + list.length + ' step' + (list.length === 1 ? '' : 's') + ': ' : 'Used by: ');
    list.forEach(function (source, i) {
      if (i > 0) p.append(', ');
      var a = document.createElement('a');
      a.href = '#' + fragment(source.element.id);
      a.textContent = source.id;
      p.append(a);
    });
    (element.tagName === 'TR' ? element.cells[0] : element).append(p);
  });
  // The cell of an indicator's value in a row: its column is the head cell with the code, among the last ones.
  function valueCell(row, code) {
    var heads = row.closest('table').tHead.rows[0].cells;
    for (var i = heads.length - 1; i > 0; i--) if (heads[i].textContent === code) return row.cells[i];
    return undefined;
  }
  var marked;
  function go() {
    var id = decodeURIComponent(location.hash.slice(1));
    if (marked) marked.classList.remove('addressed');
    marked = undefined;
    if (!id) return;
    var cut = id.lastIndexOf('/');
    var anchored = document.getElementById(id);
    if (anchored) {
      // A value anchored by its figure id: say which indicator's column it is, the header row may be far above.
      if (anchored.tagName === 'TD') anchored.setAttribute('data-code', id.slice(cut + 1));
      return;
    }
    var target = byId.get(id);
    if (!target) {
      var step = byId.get(id.slice(0, cut));
      var row = step && step.tagName === 'TR' ? step : undefined;
      var link = step && !row && step.querySelector('a.to-values');
      if (link) row = document.getElementById(decodeURIComponent(link.getAttribute('href').slice(1)));
      if (!row) return;
      target = valueCell(row, id.slice(cut + 1));
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
