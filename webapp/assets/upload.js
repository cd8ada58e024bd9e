// Client-side size check of uploads: files above the limit are refused before
// their bytes travel to the server (the server checks the size again).
window.dash_clientside = Object.assign({}, window.dash_clientside, {
    modeheat: Object.assign({}, (window.dash_clientside || {}).modeheat, {
        checkUpload: function (contents, names, config) {
            const nu = window.dash_clientside.no_update;
            if (!contents) { return nu; }
            const limit = (config && config.max_upload_bytes) || 0;
            const files = [], refused = [];
            contents.forEach(function (c, i) {
                const comma = c.indexOf(',');
                const b64 = comma < 0 ? c.length : c.length - comma - 1;
                const bytes = Math.floor(b64 * 3 / 4);
                if (limit && bytes > limit) {
                    refused.push(names[i] + ': the file is ' + (bytes / 1e6).toFixed(1) +
                                 ' MB; the upload limit is ' + (limit / 1e6) + ' MB');
                } else {
                    files.push({name: names[i], contents: c});
                }
            });
            return {files: files, refused: refused, stamp: Date.now()};
        },
        // Navigation: mark the link of the page shown.
        navClasses: function (pathname) {
            const here = "/" + (pathname || "/").replace(/^\/+|\/+$/g, "");
            return window.dash_clientside.callback_context.outputs_list.map(function (o) {
                return o.id.path === here ? "mh-nav-link mh-nav-here" : "mh-nav-link";
            });
        }
    })
});
