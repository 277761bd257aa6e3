// DriftWatch dashboard: column sorting and row filtering for the pair overview. No dependencies; the pages
// work without it (the server applies the query-string filter), this only makes them interactive.
(function () {
  'use strict';

  function rowsOf(table) {
    return Array.prototype.slice.call(table.tBodies[0].rows).filter(function (row) {
      return row.hasAttribute('data-status');
    });
  }

  // Cells carry data-sort (a raw number, or text); an empty key is an undefined figure and always sorts last.
  function keyOf(row, index, kind) {
    var cell = row.cells[index];
    var raw = cell ? cell.getAttribute('data-sort') : null;
    if (raw === null) {
      raw = cell ? cell.textContent.trim() : '';
    }
    if (kind === 'num') {
      var n = raw === '' ? NaN : parseFloat(raw);
      return isNaN(n) ? null : n;
    }
    return raw === '' ? null : raw.toLowerCase();
  }

  function sortTable(table, index, kind, descending) {
    var body = table.tBodies[0];
    var rows = rowsOf(table).map(function (row, position) {
      return { row: row, key: keyOf(row, index, kind), position: position };
    });
    rows.sort(function (a, b) {
      if (a.key === null || b.key === null) {
        return a.key === b.key ? a.position - b.position : (a.key === null ? 1 : -1);
      }
      var order = a.key < b.key ? -1 : (a.key > b.key ? 1 : 0);
      return (descending ? -order : order) || a.position - b.position;
    });
    rows.forEach(function (item) { body.appendChild(item.row); });
  }

  document.querySelectorAll('table.sortable').forEach(function (table) {
    var headers = table.tHead.rows[0].cells;
    Array.prototype.forEach.call(headers, function (th, index) {
      var button = th.querySelector('button.sort');
      if (!button) {
        return;
      }
      button.addEventListener('click', function () {
        var descending = th.getAttribute('aria-sort') === 'ascending';
        Array.prototype.forEach.call(headers, function (h) { h.removeAttribute('aria-sort'); });
        th.setAttribute('aria-sort', descending ? 'descending' : 'ascending');
        sortTable(table, index, th.getAttribute('data-kind'), descending);
      });
    });
  });

  document.querySelectorAll('form[data-filter-for]').forEach(function (form) {
    var table = document.getElementById(form.getAttribute('data-filter-for'));
    if (!table) {
      return;
    }
    var output = form.querySelector('output.shown');
    var names = ['status', 'source', 'tag', 'q'];
    var tiles = document.querySelectorAll('[data-status-filter]');

    function value(name) {
      var field = form.elements[name];
      return field ? field.value.trim() : '';
    }

    function apply(updateAddress) {
      var status = value('status');
      var source = value('source');
      var tag = value('tag');
      var text = value('q').toLowerCase();
      var rows = rowsOf(table);
      var shown = 0;
      rows.forEach(function (row) {
        var tags = ' ' + (row.getAttribute('data-tags') || '') + ' ';
        var visible = (!status || row.getAttribute('data-status') === status) &&
          (!source || row.getAttribute('data-source') === source) &&
          (!tag || tags.indexOf(' ' + tag + ' ') >= 0) &&
          (!text || (row.getAttribute('data-text') || '').indexOf(text) >= 0);
        row.hidden = !visible;
        if (visible) {
          shown += 1;
        }
      });
      if (output) {
        output.textContent = shown + ' of ' + rows.length + ' shown';
      }
      tiles.forEach(function (tile) {
        tile.classList.toggle('tile-active', tile.getAttribute('data-status-filter') === status);
      });
      if (updateAddress) {
        var params = new URLSearchParams();
        names.forEach(function (name) {
          if (value(name)) {
            params.set(name, value(name));
          }
        });
        var query = params.toString();
        try {
          history.replaceState(null, '', query ? '?' + query : location.pathname);
        } catch (e) {
          // Some browsers refuse replaceState on file:// pages (the static export); filtering still works.
        }
      }
    }

    var initial = new URLSearchParams(location.search);
    names.forEach(function (name) {
      if (initial.has(name) && form.elements[name]) {
        form.elements[name].value = initial.get(name);
      }
    });

    form.addEventListener('input', function () { apply(true); });
    form.addEventListener('change', function () { apply(true); });
    form.addEventListener('submit', function (event) {
      event.preventDefault();
      apply(true);
    });
    tiles.forEach(function (tile) {
      tile.addEventListener('click', function (event) {
        event.preventDefault();
        form.elements.status.value = tile.getAttribute('data-status-filter');
        apply(true);
      });
    });
    form.classList.add('live');
    apply(false);
  });
})();
