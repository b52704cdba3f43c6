// Sorting and filtering of the catalogue table. Without JavaScript the table is complete
// and readable as it is; this only adds sort buttons to the headers and a filter box.
(function () {
  var table = document.getElementById('catalogue');
  var tools = document.getElementById('catalogue-tools');
  if (!table || !tools || !table.tBodies[0]) return;
  var body = table.tBodies[0];
  var rows = Array.prototype.slice.call(body.rows);
  var filter = document.getElementById('catalogue-filter');
  var count = document.getElementById('catalogue-count');
  tools.hidden = false;

  function key(row, index, kind) {
    var cell = row.cells[index];
    var raw = cell.getAttribute('data-sort');
    if (kind === 'number') {
      var n = parseFloat(raw === null ? cell.textContent : raw);
      return isNaN(n) ? Infinity : n;
    }
    return cell.textContent.trim().toLowerCase();
  }

  var headers = Array.prototype.slice.call(table.tHead.rows[0].cells);
  headers.forEach(function (th, index) {
    var kind = th.getAttribute('data-kind') || 'text';
    var button = document.createElement('button');
    button.type = 'button';
    button.className = 'sort';
    button.textContent = th.textContent;
    th.textContent = '';
    th.appendChild(button);
    th.setAttribute('aria-sort', 'none');
    button.addEventListener('click', function () {
      var ascending = th.getAttribute('aria-sort') !== 'ascending';
      headers.forEach(function (other) { other.setAttribute('aria-sort', 'none'); });
      th.setAttribute('aria-sort', ascending ? 'ascending' : 'descending');
      rows.sort(function (a, b) {
        var x = key(a, index, kind), y = key(b, index, kind);
        return (x < y ? -1 : x > y ? 1 : 0) * (ascending ? 1 : -1);
      });
      rows.forEach(function (row) { body.appendChild(row); });
    });
  });

  function applyFilter() {
    var text = filter.value.trim().toLowerCase();
    var shown = 0;
    rows.forEach(function (row) {
      var match = text === '' || row.textContent.toLowerCase().indexOf(text) !== -1;
      row.hidden = !match;
      if (match) shown++;
    });
    count.textContent = shown + ' of ' + rows.length + ' products';
  }
  filter.addEventListener('input', applyFilter);
  applyFilter();
})();
