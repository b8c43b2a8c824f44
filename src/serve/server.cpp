// The study page's HTTP server on cpp-httplib (Debian's libcpp-httplib-dev; docs/serve.md says
// why): the checks every request passes before its body is read, the page, the API routes.
#include <limitline/serve/server.hpp>

#include "assets.hpp"

#include <limitline/error.hpp>

#include <fmt/format.h>
#include <httplib.h>

#include <array>
#include <fstream>
#include <random>

namespace limitline::serve {
namespace {

constexpr std::string_view kTokenHeader = "X-Limitline-Token";

// What every answer carries: nothing cached (results depend on the body), no sniffing, the
// token's URL never sent on as a referrer, no framing by another page.
void common_headers(httplib::Response& res) {
  res.set_header("Cache-Control", "no-store");
  res.set_header("X-Content-Type-Options", "nosniff");
  res.set_header("Referrer-Policy", "no-referrer");
  res.set_header("X-Frame-Options", "DENY");
}

void refuse(httplib::Response& res, int status, std::string_view why) {
  common_headers(res);
  res.status = status;
  res.set_header("Connection", "close");
  res.set_content(fmt::format("{{\"error\": \"{}\"}}\n", why), "application/json");
}

// Compares without stopping at the first difference, so the time taken tells nothing of the
// token.
bool same_secret(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  unsigned char d = 0;
  for (std::size_t i = 0; i < a.size(); ++i) d |= static_cast<unsigned char>(a[i] ^ b[i]);
  return d == 0;
}

std::string asset(std::string_view name) {
  const auto a = assets::find(name);
  if (!a) throw std::logic_error(fmt::format("study page asset {} is missing", name));
  return std::string(*a);
}

}  // namespace

std::string random_token() {
  std::array<unsigned char, 16> bytes{};
  std::ifstream urandom("/dev/urandom", std::ios::binary);
  if (!urandom.read(reinterpret_cast<char*>(bytes.data()), bytes.size())) {
    std::random_device rd;
    for (auto& b : bytes) b = static_cast<unsigned char>(rd());
  }
  std::string out;
  for (unsigned char b : bytes) out += fmt::format("{:02x}", b);
  return out;
}

struct Server::Impl {
  Api api;
  ServerOptions options;
  httplib::Server http;
  int port = 0;
  std::vector<std::string> hosts;  // the Host values that name this server
  std::string page;

  Impl(Api a, ServerOptions o) : api(std::move(a)), options(std::move(o)) {
    if (options.token.empty()) options.token = random_token();
    // The page names its script and style with the token, which every request must carry.
    page = asset("page.html");
    for (auto at = page.find("{{TOKEN}}"); at != std::string::npos; at = page.find("{{TOKEN}}"))
      page.replace(at, 9, options.token);
  }

  bool host_ok(const std::string& host) const {
    for (const auto& h : hosts)
      if (host == h) return true;
    return false;
  }

  bool origin_ok(const std::string& origin) const {
    for (const auto& h : hosts)
      if (origin == "http://" + h) return true;
    return false;
  }

  httplib::Server::HandlerResponse check(const httplib::Request& req, httplib::Response& res) {
    if (!host_ok(req.get_header_value("Host"))) {
      refuse(res, 403, "the Host header does not name this server");
      return httplib::Server::HandlerResponse::Handled;
    }
    if (req.has_header("Origin") && !origin_ok(req.get_header_value("Origin"))) {
      refuse(res, 403, "the request comes from another site's page");
      return httplib::Server::HandlerResponse::Handled;
    }
    const std::string token = req.has_header(std::string(kTokenHeader).c_str())
                                  ? req.get_header_value(std::string(kTokenHeader).c_str())
                                  : req.get_param_value("token");
    if (!same_secret(token, options.token)) {
      refuse(res, 403, "no valid token: open the URL limitline serve printed");
      return httplib::Server::HandlerResponse::Handled;
    }
    return httplib::Server::HandlerResponse::Unhandled;
  }

  void send(httplib::Response& res, const Response& r) {
    common_headers(res);
    res.status = r.status;
    if (!r.download_name.empty())
      res.set_header("Content-Disposition",
                     fmt::format("attachment; filename=\"{}\"", r.download_name));
    res.set_content(r.body, r.content_type.c_str());
  }

  // The fields of a request: multipart form data (the page's FormData) or URL-encoded, the
  // token left out.
  static Fields fields_of(const httplib::Request& req) {
    Fields f;
    for (const auto& [name, part] : req.files) f.emplace(name, part.content);
    for (const auto& [name, value] : req.params)
      if (name != "token") f.emplace(name, value);
    return f;
  }

  void serve_page(httplib::Response& res) {
    common_headers(res);
    // The page's own script and style only; SVG pictures are shown as images, so nothing in
    // them can run; fetches go to this server alone.
    res.set_header("Content-Security-Policy",
                   "default-src 'none'; script-src 'self'; style-src 'self'; img-src blob: data:; "
                   "connect-src 'self' blob:; form-action 'none'; frame-ancestors 'none'; "
                   "base-uri 'none'");
    res.set_content(page, "text/html; charset=utf-8");
  }

  void routes() {
    http.set_pre_routing_handler(
        [this](const httplib::Request& req, httplib::Response& res) { return check(req, res); });
    http.Get("/", [this](const httplib::Request&, httplib::Response& res) { serve_page(res); });
    http.Get("/page.js", [](const httplib::Request&, httplib::Response& res) {
      common_headers(res);
      res.set_content(asset("page.js"), "text/javascript; charset=utf-8");
    });
    http.Get("/page.css", [](const httplib::Request&, httplib::Response& res) {
      common_headers(res);
      res.set_content(asset("page.css"), "text/css; charset=utf-8");
    });
    for (const Endpoint& e : endpoints()) {
      const std::string path = fmt::format("/api/{}", e.name);
      const std::string name(e.name);
      auto handler = [this, name](const httplib::Request& req, httplib::Response& res) {
        send(res, api.handle(name, fields_of(req)));
      };
      if (e.method == "GET")
        http.Get(path, handler);
      else
        http.Post(path, handler);
    }
    http.set_error_handler([](const httplib::Request&, httplib::Response& res) {
      if (res.status == 413)
        refuse(res, 413,
               "the upload is larger than the server accepts (see limitline serve --help)");
      else if (res.status == 404)
        refuse(res, 404, "no such page or endpoint");
    });
    http.set_exception_handler([](const httplib::Request&, httplib::Response& res,
                                  std::exception_ptr) { refuse(res, 500, "internal error"); });
  }
};

Server::Server(Api api, ServerOptions options)
    : impl_(std::make_unique<Impl>(std::move(api), std::move(options))) {
  Impl& s = *impl_;
  const unsigned threads = s.options.threads == 0 ? 1 : s.options.threads;
  s.http.new_task_queue = [threads] { return new httplib::ThreadPool(threads); };
  s.http.set_payload_max_length(s.options.max_upload_bytes);
  s.http.set_read_timeout(10, 0);
  s.http.set_write_timeout(10, 0);
  s.http.set_keep_alive_timeout(5);
  s.http.set_keep_alive_max_count(100);
  s.routes();
  const int port =
      s.options.port == 0
          ? s.http.bind_to_any_port(s.options.host)
          : (s.http.bind_to_port(s.options.host, s.options.port) ? s.options.port : -1);
  if (port <= 0)
    throw InputError(
        fmt::format("cannot listen on {}:{} (in use, not an address of this "
                    "machine, or a port below 1024 without the right)",
                    s.options.host, s.options.port));
  s.port = port;
  const std::string p = std::to_string(port);
  s.hosts = {"127.0.0.1:" + p, "localhost:" + p, "[::1]:" + p};
  if (s.options.host != "127.0.0.1" && s.options.host != "localhost")
    s.hosts.push_back((s.options.host.find(':') != std::string::npos ? "[" + s.options.host + "]"
                                                                     : s.options.host) +
                      ":" + p);
}

Server::~Server() { stop(); }

int Server::port() const { return impl_->port; }
const std::string& Server::token() const { return impl_->options.token; }

std::string Server::url() const {
  const std::string& h = impl_->options.host;
  const std::string host = h.find(':') != std::string::npos ? "[" + h + "]" : h;
  return fmt::format("http://{}:{}/?token={}", host, impl_->port, impl_->options.token);
}

void Server::run() { impl_->http.listen_after_bind(); }

void Server::stop() {
  if (impl_) impl_->http.stop();
}

}  // namespace limitline::serve
