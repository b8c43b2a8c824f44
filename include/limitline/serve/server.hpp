#pragma once
// The local web server of `limitline serve`: the study page and its API (serve/api.hpp) on one
// port, for one user on this machine. Security model (README §serve): it listens on 127.0.0.1
// unless told otherwise; every request must carry the random token of the URL printed at start
// (as ?token= or the X-Limitline-Token header), else 403; its Host must name this server and
// its Origin, when sent, this server's page (DNS rebinding, other sites' pages: 403); bodies
// over the upload cap are refused with 413; a fixed number of worker threads, read and write
// timeouts; no request names a file on disk.
#include <limitline/serve/api.hpp>

#include <cstddef>
#include <memory>
#include <string>

namespace limitline::serve {

struct ServerOptions {
  std::string host = "127.0.0.1";
  int port = 0;                                     // 0: a free port chosen by the system
  unsigned threads = 4;                             // worker threads (requests at once)
  std::size_t max_upload_bytes = 16 * 1024 * 1024;  // the largest request body
  std::string token;                                // empty: a random one
};

// 32 hex digits from the system's random source (/dev/urandom, else std::random_device).
std::string random_token();

class Server {
 public:
  // Binds now: InputError "cannot listen on HOST:PORT: ..." when it cannot.
  Server(Api api, ServerOptions options);
  ~Server();
  Server(const Server&) = delete;
  Server& operator=(const Server&) = delete;

  int port() const;
  const std::string& token() const;
  // http://HOST:PORT/?token=...
  std::string url() const;
  // Serves until stop(); returns then. Call once.
  void run();
  // From any thread: stops accepting, lets the requests under way finish, makes run() return.
  void stop();

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace limitline::serve
